// Light characteristics as written on charts (common chart notation; examples from the IALA
// Maritime Buoyage System summary in ../shared/TRADE.md).
import { describe, expect, it } from "vitest";
import { characteristicWarning, defaultCharacteristics, IALA_CATEGORIES } from "~/lib/aids/iala";
import { parseLightCharacteristic } from "~/lib/aids/light";

function ok(text: string) {
  const r = parseLightCharacteristic(text);
  if (!r.ok) throw new Error(`${text}: ${r.error}`);
  return r.value;
}
function err(text: string) {
  const r = parseLightCharacteristic(text);
  if (r.ok) throw new Error(`${text} was accepted as ${r.value.text}`);
  return r.error;
}

describe("parseLightCharacteristic", () => {
  it.each([
    ["Fl(2) R 10s", "Fl", [2], ["R"], 10],
    ["VQ(3) 5s", "VQ", [3], ["W"], 5],
    ["Iso W 4s", "Iso", null, ["W"], 4],
    ["Oc G 6s", "Oc", null, ["G"], 6],
    ["Fl(2+1) G 10s", "Fl", [2, 1], ["G"], 10],
    ["LFl 10s", "LFl", null, ["W"], 10],
    ["F R", "F", null, ["R"], null],
    ["Q G", "Q", null, ["G"], null],
    ["Oc WRG 4s", "Oc", null, ["W", "R", "G"], 4],
    ["Fl(3)G10s", "Fl", [3], ["G"], 10],
  ])("%s → rhythm, group, colours, period", (text, rhythm, group, colours, period) => {
    const v = ok(text);
    expect(v.rhythm).toBe(rhythm);
    expect(v.group).toEqual(group);
    expect(v.colours).toEqual(colours);
    expect(v.periodS).toBe(period);
  });

  it("reads a composite south cardinal Q(6)+LFl 15s", () => {
    const v = ok("Q(6)+LFl 15s");
    expect(v).toMatchObject({ rhythm: "Q", group: [6], composite: { rhythm: "LFl", group: null }, colours: ["W"], periodS: 15 });
    expect(v.text).toBe("Q(6)+LFl 15s");
  });

  it("reads Morse and alternating lights", () => {
    expect(ok("Mo(A) 8s")).toMatchObject({ rhythm: "Mo", morse: "A", periodS: 8 });
    expect(ok("Al.Bu.Y 3s")).toMatchObject({ alternating: true, colours: ["Bu", "Y"], periodS: 3, text: "Al.Bu.Y 3s" });
  });

  it("normalises spacing", () => {
    expect(ok("  Fl(2)   R  10s ").text).toBe("Fl(2) R 10s");
    expect(ok("Fl(3)G10s").text).toBe("Fl(3) G 10s");
  });

  it.each([
    ["", /Enter the light characteristic/],
    ["Flx R 10s", /"Flx" is not a light rhythm/],
    ["fl(2) r 10s", /not a light rhythm/],
    ["Fl(2 R 10s", /closing bracket/],
    ["Fl(2) X 10s", /"X" is not a light colour/],
    ["Fl(2) R", /needs a period/],
    ["F R 5s", /fixed light .* no period/],
    ["Mo 8s", /Morse light needs its letter/],
    ["Fl(0) 5s", /1 to 12 flashes/],
    ["Fl(a) 5s", /must be a number of flashes/],
    ["Fl R 10", /number of seconds followed by s/],
    ["Fl R 500s", /at most 120 s/],
    ["Al.W 4s", /at least two colours/],
  ])("rejects %j with a clear message", (text, message) => {
    expect(err(text)).toMatch(message);
  });
});

describe("IALA categories", () => {
  it("every default characteristic parses and raises no warning", () => {
    for (const c of IALA_CATEGORIES) {
      for (const region of ["A", "B"] as const) {
        for (const text of defaultCharacteristics(c, region)) {
          expect(characteristicWarning(c, region, ok(text)), `${c} ${region} ${text}`).toBeNull();
        }
      }
    }
  });
  it("warns about a green light on a region A port-hand buoy, and the wrong cardinal group", () => {
    expect(characteristicWarning("port", "A", ok("Fl G 5s"))).toMatch(/normally shows R/);
    expect(characteristicWarning("port", "B", ok("Fl G 5s"))).toBeNull();
    expect(characteristicWarning("east_cardinal", "A", ok("VQ(6) 10s"))).toMatch(/VQ\(3\) 5s/);
  });
});
