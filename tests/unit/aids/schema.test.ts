import { describe, expect, it } from "vitest";
import { aidInputSchema, checkCsvHeader, swingRadiusOf, validateCsvRows } from "~/lib/aids/schema";

const row = {
  code: "KS3",
  name: "KS3 starboard-hand buoy",
  aid_type: "buoy",
  iala_category: "starboard",
  iala_region: "A",
  light_characteristic: "Fl(2) G 10s",
  charted_position: "55°11.520′N 003°00.830′E",
  charted_crs: "EPSG:4326",
  chain_length_m: "30",
  depth_m: "10",
  swing_radius_m: "",
  status: "operating",
  remarks: "",
};

describe("aid input", () => {
  it("normalises a valid row", () => {
    const r = aidInputSchema.parse(row);
    expect(r).toMatchObject({ code: "KS3", aidType: "buoy", ialaCategory: "starboard", lightCharacteristic: "Fl(2) G 10s", chainLengthM: 30, depthM: 10, swingRadiusM: null });
    expect(r.lat).toBeCloseTo(55 + 11.52 / 60, 9);
    expect(r.lon).toBeCloseTo(3 + 0.83 / 60, 9);
    // √(30² − 10²) = 28.28 m (taut-chain geometry, ../shared/TRADE.md)
    expect(swingRadiusOf(r)).toBeCloseTo(28.284, 3);
  });

  it("converts an ED50 charted position to WGS 84 (shift of the order of 100 m in the North Sea)", () => {
    const r = aidInputSchema.parse({ ...row, charted_crs: "EPSG:4230" });
    const w = aidInputSchema.parse(row);
    const dLatM = (w.lat - r.lat) * 111_300;
    const dLonM = (w.lon - r.lon) * 111_300 * Math.cos((55.2 * Math.PI) / 180);
    const shift = Math.hypot(dLatM, dLonM);
    expect(shift).toBeGreaterThan(50);
    expect(shift).toBeLessThan(250);
  });

  it.each([
    [{ light_characteristic: "Fl(2) X 10s" }, "light_characteristic", /not a light colour/],
    [{ charted_position: "95°00′N 003°00′E" }, "charted_position", /./],
    [{ depth_m: "" }, "depth_m", /both the chain length and the depth/],
    [{ depth_m: "40" }, "depth_m", /less than the chain length/],
    [{ chain_length_m: "", depth_m: "" }, "swing_radius_m", /mooring .* or a stated swing radius/],
    [{ iala_category: "purple" }, "iala_category", /Unknown IALA category/],
    [{ aid_type: "raft" }, "aid_type", /buoy, beacon or light/],
    [{ charted_crs: "EPSG:9999" }, "charted_crs", /./],
  ])("rejects %j on %s", (change, field, message) => {
    const r = aidInputSchema.safeParse({ ...row, ...change });
    expect(r.success).toBe(false);
    const issue = r.error!.issues.find((i) => i.path[0] === field);
    expect(issue?.message, JSON.stringify(r.error!.issues)).toMatch(message);
  });

  it("CSV: header check and row-by-row errors with line numbers, duplicate codes", () => {
    expect(checkCsvHeader(["code", "name", "aid_type", "charted_position"])).toBeNull();
    expect(checkCsvHeader(["code", "name", "colour"])).toMatch(/Unknown column: colour/);
    const res = validateCsvRows([row, { ...row, light_characteristic: "Fl(2" }, { ...row }]);
    expect(res.map((r) => r.ok)).toEqual([true, false, false]);
    expect(res[1]!.line).toBe(3);
    expect(res[2]!.errors![0]!.message).toMatch(/already used on line 2/);
  });
});
