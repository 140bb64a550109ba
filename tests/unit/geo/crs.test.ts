import proj4 from "proj4";
import { describe, expect, it } from "vitest";
import {
  conversionInfo,
  convert,
  fromWgs84,
  proj4Definition,
  resolveCrs,
  toWgs84,
  type GeographicCoord,
  type ProjectedCoord,
} from "~/lib/geo/crs";
import {
  DATUMS,
  ELLIPSOIDS,
  getCrs,
  getDatum,
  listCrs,
  parseCrsCode,
  resolveTransformation,
  toPositionVector,
  type DatumKey,
  type DatumTransformation,
} from "~/lib/geo/crs-registry";
import { GeoInputError } from "~/lib/geo/errors";

const dms = (d: number, m: number, s: number) => d + m / 60 + s / 3600;
const MM = 0.001;
/** 1 mm expressed in degrees of latitude (≈ 9e-9°). */
const MM_DEG = 1e-3 / 111_000;

describe("published check values", () => {
  it("Ordnance Survey worked example: OSGB36 52°39′27.2531″N 1°43′04.5177″E ↔ E 651409.903 N 313177.270", () => {
    // Source: Ordnance Survey, "A guide to coordinate systems in Great Britain", worked example
    // of the Transverse Mercator projection (National Grid), values as quoted in the issue.
    const en = convert("EPSG:4277", "EPSG:27700", { lat: dms(52, 39, 27.2531), lon: dms(1, 43, 4.5177) }) as ProjectedCoord;
    expect(Math.abs(en.easting - 651409.903)).toBeLessThan(MM);
    expect(Math.abs(en.northing - 313177.27)).toBeLessThan(MM);
    const ll = convert("EPSG:27700", "EPSG:4277", { easting: 651409.903, northing: 313177.27 }) as GeographicCoord;
    expect(Math.abs(ll.lat - dms(52, 39, 27.2531))).toBeLessThan(MM_DEG);
    expect(Math.abs(ll.lon - dms(1, 43, 4.5177))).toBeLessThan(MM_DEG * 2);
  });

  it("IOGP Guidance Note 7-2 Transverse Mercator example: OSGB36 50°30′N 0°30′E → E 577274.99 N 69740.50", () => {
    // Source: IOGP Geomatics Guidance Note 7 part 2, Transverse Mercator (EPSG method 9807)
    // worked example for OSGB 1936 / British National Grid; published to the centimetre.
    // proj4's tmerc series lands 8 mm from the published northing here (2.5° from the central
    // meridian), so the check is to 1 cm, the published precision.
    const en = convert("EPSG:4277", "EPSG:27700", { lat: 50.5, lon: 0.5 }) as ProjectedCoord;
    expect(Math.abs(en.easting - 577274.99)).toBeLessThan(0.01);
    expect(Math.abs(en.northing - 69740.5)).toBeLessThan(0.01);
  });

  it("Snyder's ellipsoidal Transverse Mercator example on Clarke 1866 = NAD27 / UTM zone 18N", () => {
    // Source: J. P. Snyder, Map Projections — A Working Manual (USGS Professional Paper 1395,
    // 1987), Transverse Mercator numerical example: Clarke 1866, φ 40°30′N, λ 73°30′W,
    // λ0 75°W, k0 0.9996 → x = 127,106.5 m, y = 4,484,124.4 m (printed to 0.1 m). With the
    // UTM false easting of 500 000 m that is EPSG:26718.
    const en = convert("EPSG:4267", "EPSG:26718", { lat: 40.5, lon: -73.5 }) as ProjectedCoord;
    expect(Math.abs(en.easting - 627106.5)).toBeLessThan(0.06);
    expect(Math.abs(en.northing - 4484124.4)).toBeLessThan(0.06);
  });

  it("IOGP GN 7-2 WGS 72 geocentric example needs the real WGS 72 ellipsoid (+ellps trap)", () => {
    // Source: IOGP GN 7-2, Position Vector transformation example: WGS 72 φ 55°N λ 4°E h 0 is
    // X 3657660.66 Y 255768.55 Z 5201382.11 m on the WGS 72 ellipsoid (a 6378135, 1/f 298.26).
    const ours = proj4(`+proj=longlat +a=${ELLIPSOIDS.wgs72.a} +rf=${ELLIPSOIDS.wgs72.rf} +no_defs`, `+proj=geocent +a=${ELLIPSOIDS.wgs72.a} +rf=${ELLIPSOIDS.wgs72.rf} +units=m +no_defs`, [4, 55, 0]);
    expect(ours[0]).toBeCloseTo(3657660.66, 2);
    expect(ours[1]).toBeCloseTo(255768.55, 2);
    expect(ours[2]).toBeCloseTo(5201382.11, 2);
    // The trap (STACK.md): proj4 does not know "+ellps=WGS72" and silently uses WGS 84 — over a
    // metre wrong — which is why the registry always writes +a/+rf.
    const trap = proj4("+proj=longlat +ellps=WGS72 +no_defs", "+proj=geocent +ellps=WGS72 +units=m +no_defs", [4, 55, 0]);
    expect(Math.hypot(trap[0]! - 3657660.66, trap[1]! - 255768.55, trap[2]! - 5201382.11)).toBeGreaterThan(1);
    for (const c of listCrs()) {
      const crs = getCrs(c.code)!;
      const def = proj4Definition(crs, getDatum(crs.datum).transformations[0]!);
      expect(def).not.toMatch(/\+ellps=|\+datum=/);
      expect(def).toMatch(/\+a=\d+(\.\d+)? \+rf=\d+(\.\d+)? \+towgs84=/);
    }
  });

  it("IOGP GN 7-2 Position Vector example (WGS 72 → WGS 84, EPSG:1238) and the Coordinate Frame sign trap", () => {
    // Source: IOGP GN 7-2, Position Vector 7-parameter example: tZ +4.5 m, rZ +0.554″,
    // dS +0.219 ppm: X 3657660.66 Y 255768.55 Z 5201382.11 → X 3657660.78 Y 255778.43
    // Z 5201387.75 (cm). The Coordinate Frame example uses the same transformation written with
    // rZ −0.554″.
    const wgs72 = getDatum("WGS72");
    const t1238 = wgs72.transformations.find((t) => t.id === "EPSG:1238")!;
    const geocent = (towgs84: number[]) =>
      proj4(
        `+proj=geocent +a=${ELLIPSOIDS.wgs72.a} +rf=${ELLIPSOIDS.wgs72.rf} +towgs84=${towgs84.join(",")} +units=m +no_defs`,
        `+proj=geocent +a=${ELLIPSOIDS.wgs84.a} +rf=${ELLIPSOIDS.wgs84.rf} +towgs84=0,0,0 +units=m +no_defs`,
        [3657660.66, 255768.55, 5201382.11],
      );
    const pv = geocent(toPositionVector(t1238));
    expect(Math.abs(pv[0]! - 3657660.78)).toBeLessThan(0.01);
    expect(Math.abs(pv[1]! - 255778.43)).toBeLessThan(0.01);
    expect(Math.abs(pv[2]! - 5201387.75)).toBeLessThan(0.01);

    // The same transformation published in the Coordinate Frame convention must have its
    // rotations negated before it becomes +towgs84 …
    const asCoordinateFrame: DatumTransformation = { ...t1238, method: "coordinate_frame", params: [0, 0, 4.5, 0, 0, -0.554, 0.219] };
    expect(toPositionVector(asCoordinateFrame)).toEqual([0, 0, 4.5, -0, -0, 0.554, 0.219]);
    const cf = geocent(toPositionVector(asCoordinateFrame));
    expect(Math.hypot(cf[0]! - pv[0]!, cf[1]! - pv[1]!, cf[2]! - pv[2]!)).toBeLessThan(1e-6);
    // … and used as written it lands ~20 m away.
    const wrong = geocent([0, 0, 4.5, 0, 0, -0.554, 0.219]);
    expect(Math.hypot(wrong[0]! - 3657660.78, wrong[1]! - 255778.43, wrong[2]! - 5201387.75)).toBeGreaterThan(15);
  });
});

// An independent 7-parameter Helmert (IOGP GN 7-2 §2.4.3 formulas, small-angle Position Vector
// form) to check that the registry parameters reach proj4 with the right signs and units.
function toEcef(lat: number, lon: number, h: number, a: number, rf: number) {
  const f = 1 / rf;
  const e2 = f * (2 - f);
  const p = (lat * Math.PI) / 180;
  const l = (lon * Math.PI) / 180;
  const n = a / Math.sqrt(1 - e2 * Math.sin(p) ** 2);
  return [(n + h) * Math.cos(p) * Math.cos(l), (n + h) * Math.cos(p) * Math.sin(l), (n * (1 - e2) + h) * Math.sin(p)] as const;
}
function fromEcef(x: number, y: number, z: number, a: number, rf: number) {
  const f = 1 / rf;
  const e2 = f * (2 - f);
  const lon = Math.atan2(y, x);
  const p = Math.hypot(x, y);
  let lat = Math.atan2(z, p * (1 - e2));
  for (let i = 0; i < 10; i++) {
    const n = a / Math.sqrt(1 - e2 * Math.sin(lat) ** 2);
    const h = p / Math.cos(lat) - n;
    lat = Math.atan2(z, p * (1 - (e2 * n) / (n + h)));
  }
  return { lat: (lat * 180) / Math.PI, lon: (lon * 180) / Math.PI };
}
function helmertPV([x, y, z]: readonly [number, number, number], p: readonly number[]) {
  const [tx, ty, tz, rx = 0, ry = 0, rz = 0, ds = 0] = p;
  const s = (Math.PI / 180 / 3600) as number;
  const [a, b, c] = [rx! * s, ry! * s, rz! * s];
  const m = 1 + ds! * 1e-6;
  return [tx! + m * (x - c * y + b * z), ty! + m * (c * x + y - a * z), tz! + m * (-b * x + a * y + z)] as const;
}

describe("every registry transformation reaches proj4 correctly", () => {
  const samples: Record<DatumKey, [number, number]> = {
    WGS84: [0, 0],
    ETRS89: [55.2, 3.03],
    ED50: [55.2, 3.03],
    OSGB36: [52.66, 1.72],
    NAD27: [40.5, -73.5],
    NAD83: [40.5, -73.5],
    WGS72: [55, 4],
    IRENET95: [53.35, -6.26],
  };
  for (const key of Object.keys(DATUMS) as DatumKey[]) {
    for (const t of getDatum(key).transformations) {
      it(`${key} ${t.id} (${t.name})`, () => {
        const [lat, lon] = samples[key];
        const code = { WGS84: 4326, ETRS89: 4258, ED50: 4230, OSGB36: 4277, NAD27: 4267, NAD83: 4269, WGS72: 4322, IRENET95: 0 }[key];
        const e = ELLIPSOIDS[getDatum(key).ellipsoid];
        const ecef = helmertPV(toEcef(lat, lon, 0, e.a, e.rf), toPositionVector(t));
        const expected = fromEcef(ecef[0], ecef[1], ecef[2], ELLIPSOIDS.wgs84.a, ELLIPSOIDS.wgs84.rf);
        let got: GeographicCoord;
        if (code === 0) {
          // IRENET95 has no geographic CRS here: project the IRENET95 position onto the Irish
          // Transverse Mercator grid with proj4 alone, then read it back through EPSG:2157.
          const grs80 = `+a=${e.a} +rf=${e.rf}`;
          const [x, y] = proj4(`+proj=longlat ${grs80} +no_defs`, `${getCrs(2157)!.projection} ${grs80} +no_defs`, [lon, lat]);
          got = toWgs84("EPSG:2157", { easting: x!, northing: y! }, { transformation: t.id });
        } else {
          got = toWgs84(code, { lat, lon }, { transformation: t.id });
        }
        expect(Math.abs(got.lat - expected.lat)).toBeLessThan(MM_DEG);
        expect(Math.abs(got.lon - expected.lon)).toBeLessThan(MM_DEG * 2);
        // Every transformation names its source and EPSG accuracy.
        expect(t.source.length).toBeGreaterThan(5);
        expect(t.accuracyM).toBeGreaterThanOrEqual(0);
        if (t.id.startsWith("EPSG:")) expect(t.id).toMatch(/^EPSG:\d{4,5}$/);
      });
    }
  }

  it("ED50 default is EPSG:1133 and EPSG:1311 can be chosen instead; they differ by metres", () => {
    const p = { lat: 55.205, lon: 3.0183333 };
    const d = toWgs84("EPSG:4230", p);
    const alt = toWgs84("EPSG:4230", p, { transformation: "EPSG:1311" });
    expect(resolveTransformation("ED50")).toMatchObject({ ok: true, transformation: { id: "EPSG:1133" } });
    const dy = (d.lat - alt.lat) * 111_000;
    const dx = (d.lon - alt.lon) * 111_000 * Math.cos((55.2 * Math.PI) / 180);
    expect(Math.hypot(dx, dy)).toBeGreaterThan(1);
    expect(Math.hypot(dx, dy)).toBeLessThan(20);
    // A bare number is read as an EPSG code too.
    expect(toWgs84("EPSG:4230", p, { transformation: "1311" })).toEqual(alt);
  });

  it("NAD27 needs a choice: CONUS (EPSG:1173) by default, Canada (EPSG:1172) selectable", () => {
    expect(getDatum("NAD27").defaultTransformation).toBe("EPSG:1173");
    const a = toWgs84("EPSG:4267", { lat: 45, lon: -75 });
    const b = toWgs84("EPSG:4267", { lat: 45, lon: -75 }, { transformation: "EPSG:1172" });
    expect(a).not.toEqual(b);
  });
});

describe("conversions", () => {
  it("WGS 84 ↔ WGS 84 is the identity", () => {
    expect(toWgs84("EPSG:4326", { lat: 55.2, lon: 3.03 })).toEqual({ lat: 55.2, lon: 3.03 });
    expect(fromWgs84(4326, 55.2, 3.03)).toEqual({ lat: 55.2, lon: 3.03 });
  });

  it("Kestrel Sound in WGS 84 / UTM zone 31N and back", () => {
    const en = fromWgs84("EPSG:32631", 55.2, 3.03) as ProjectedCoord;
    expect(en.easting).toBeGreaterThan(400_000);
    expect(en.easting).toBeLessThan(600_000);
    const back = toWgs84("EPSG:32631", en);
    expect(back.lat).toBeCloseTo(55.2, 9);
    expect(back.lon).toBeCloseTo(3.03, 9);
  });

  it("southern UTM zones use the 10 000 km false northing", () => {
    const en = fromWgs84("EPSG:32756", -33.86, 151.21) as ProjectedCoord;
    expect(en.northing).toBeGreaterThan(6_000_000);
    expect(en.northing).toBeLessThan(10_000_000);
  });

  it("converters are cached per CRS and transformation", async () => {
    const { cachedConverterCount } = await import("~/lib/geo/crs");
    toWgs84("EPSG:23031", { easting: 500000, northing: 6100000 });
    const n = cachedConverterCount();
    for (let i = 0; i < 10; i++) toWgs84("EPSG:23031", { easting: 500000 + i, northing: 6100000 });
    expect(cachedConverterCount()).toBe(n);
  });

  it("the height trap: proj4's plain call passes heights through a datum shift unchanged", () => {
    // STACK.md: proj4(from, to, [x, y, z]) returns z unchanged for geographic → geographic;
    // forward(point, true) transforms it. Tidewire converts horizontal positions only.
    const from = proj4Definition(getCrs(4326)!, getDatum("WGS84").transformations[0]!);
    const to = proj4Definition(getCrs(4277)!, getDatum("OSGB36").transformations[0]!);
    expect(proj4(from, to, [-1, 51, 100])[2]).toBe(100);
    expect(proj4(from, to).forward([-1, 51, 100], true)[2]).not.toBeCloseTo(100, 0);
    expect(Object.keys(toWgs84("EPSG:4277", { lat: 51, lon: -1 })).sort()).toEqual(["lat", "lon"]);
  });

  it("conversionInfo names the transformations and their combined accuracy", () => {
    const info = conversionInfo("EPSG:4230", "EPSG:27700");
    expect(info.transformations.map((t) => t.id)).toEqual(["EPSG:1133", "EPSG:1314"]);
    expect(info.accuracyM).toBeCloseTo(Math.hypot(10, 2), 12);
    expect(conversionInfo(4326, 32631).transformations).toEqual([]);
    // Same datum (OSGB36 geographic ↔ its grid): a projection only, no datum shift.
    expect(conversionInfo("EPSG:4277", "EPSG:27700")).toMatchObject({ transformations: [], accuracyM: 0 });
    expect(conversionInfo("EPSG:4230", "EPSG:23031", { toTransformation: "EPSG:1311" }).transformations.map((t) => t.id)).toEqual(["EPSG:1133", "EPSG:1311"]);
  });
});

describe("rejections", () => {
  it("parseCrsCode", () => {
    expect(parseCrsCode("EPSG:4230")).toMatchObject({ ok: true, code: 4230 });
    expect(parseCrsCode("epsg:4230")).toMatchObject({ ok: true, code: 4230 });
    expect(parseCrsCode("4230")).toMatchObject({ ok: true, code: 4230 });
    expect(parseCrsCode("urn:ogc:def:crs:EPSG::27700")).toMatchObject({ ok: true, code: 27700 });
    expect(parseCrsCode("")).toEqual({ ok: false, error: "Give a coordinate reference system as EPSG:<code>, e.g. EPSG:4326" });
    expect(parseCrsCode("WGS84")).toEqual({ ok: false, error: '"WGS84" is not an EPSG code: write it as EPSG:<code>, e.g. EPSG:4326' });
    expect(parseCrsCode("EPSG:3857")).toEqual({
      ok: false,
      error:
        "EPSG:3857 is not supported. Supported: EPSG:4326, 4258, 4230, 4277, 4267, 4269, 4322, 27700, 2157 and UTM zones 326xx/327xx, 258xx, 230xx, 267xx, 269xx",
    });
    expect(parseCrsCode("EPSG:25827").ok).toBe(false); // ETRS89 / UTM 27N is outside EPSG's 28–38 range
    expect(parseCrsCode("EPSG:32661").ok).toBe(false);
  });

  it("unknown transformation for a datum", () => {
    expect(resolveTransformation("ED50", "EPSG:1314")).toEqual({
      ok: false,
      error: "EPSG:1314 is not a transformation from ED50 to WGS 84 here; choose EPSG:1133 or EPSG:1311 or EPSG:1138 or EPSG:1275",
    });
    expect(() => toWgs84("EPSG:4230", { lat: 55, lon: 3 }, { transformation: "EPSG:9999" })).toThrow(GeoInputError);
  });

  it("coordinate kind must match the CRS", () => {
    expect(() => toWgs84("EPSG:27700", { lat: 52, lon: 1 })).toThrow("EPSG:27700 is projected: give an easting and northing in metres");
    expect(() => toWgs84("EPSG:4277", { easting: 1, northing: 2 })).toThrow("EPSG:4277 is geographic: give a latitude and longitude");
    expect(() => fromWgs84("EPSG:4277", 91, 0)).toThrow("Latitude must be within ±90° and longitude within ±180°");
    expect(() => resolveCrs("EPSG:1")).toThrow(GeoInputError);
  });

  it("convert reports which side is wrong", () => {
    try {
      convert("EPSG:4326", "EPSG:9", { lat: 1, lon: 1 });
      expect.unreachable();
    } catch (e) {
      expect((e as GeoInputError).field).toBe("to");
    }
    try {
      convert("EPSG:4230", "EPSG:4326", { lat: 1, lon: 1 }, { fromTransformation: "EPSG:1" });
      expect.unreachable();
    } catch (e) {
      expect((e as GeoInputError).field).toBe("fromTransformation");
    }
  });
});

describe("listCrs for pickers", () => {
  it("lists geographic CRSs, national grids and UTM zones with their transformations", () => {
    const all = listCrs();
    expect(all.slice(0, 9).map((c) => c.id)).toEqual([
      "EPSG:4326",
      "EPSG:4258",
      "EPSG:4230",
      "EPSG:4277",
      "EPSG:4267",
      "EPSG:4269",
      "EPSG:4322",
      "EPSG:27700",
      "EPSG:2157",
    ]);
    expect(all.find((c) => c.id === "EPSG:23031")).toMatchObject({ label: "ED50 / UTM zone 31N", kind: "projected", defaultTransformation: "EPSG:1133" });
    expect(all.find((c) => c.id === "EPSG:32731")).toMatchObject({ label: "WGS 84 / UTM zone 31S" });
    expect(all).toHaveLength(9 + 60 + 60 + 11 + 11 + 22 + 23);
    expect(listCrs({ includeUtm: false })).toHaveLength(9);
  });
});
