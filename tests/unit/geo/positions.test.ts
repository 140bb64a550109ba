import { describe, expect, it } from "vitest";
import {
  formatAll,
  formatBearingTrue,
  formatPosition,
  parsePosition,
  parsePositionGeneral,
  parsePositionOrThrow,
  parseProjectedPair,
  PositionParseError,
} from "~/lib/geo/positions";

const LAT = 50 + 47.12 / 60;
const LON = -(1 + 6.45 / 60);

function ok(text: string) {
  const r = parsePosition(text);
  if (!r.ok) throw new Error(`expected "${text}" to parse, got: ${r.error}`);
  return r;
}
function bad(text: string) {
  const r = parsePosition(text);
  if (r.ok) throw new Error(`expected "${text}" to be refused, got ${r.lat}, ${r.lon}`);
  return r;
}

describe("parsePosition: accepted forms", () => {
  // Forms from the issue and TRADE.md (mariners' DDM, common practice; broadcast form from the
  // joint IMO/IHO/WMO Manual on Maritime Safety Information, MSC.1/Circ.1310 §5.5).
  it.each([
    ["50°47.12′N 001°06.45′W"],
    ["50 47.12N 1 6.45W"],
    ["50-47.12N 001-06.45W"],
    ["50°47.12'N 001°06.45'W"],
    ["50º47.12'N 001º06.45'W"],
    ["50˚47.12’N 1˚6.45’W"],
    ["N50°47.12′ W001°06.45′"],
    ["N 50 47.12, W 1 6.45"],
    ["50°47.12′ N, 001°06.45′ W"],
    ["50°47.12′n 001°06.45′w"],
    ["50 47.12 north 1 6.45 west"],
    ["  50°47.12′N\u00a0001°06.45′W  "],
  ])("DDM %s", (text) => {
    const r = ok(text);
    expect(r.lat).toBeCloseTo(LAT, 12);
    expect(r.lon).toBeCloseTo(LON, 12);
  });

  it.each([
    ['50°47′07.2″N 001°06′27.0″W'],
    [`50°47'07.2"N 1°06'27"W`],
    [`50°47'07.2''N 1°06'27''W`],
    ["50 47 07.2N 001 06 27W"],
    ["50-47-07.2N 001-06-27W"],
  ])("DMS %s", (text) => {
    const r = ok(text);
    expect(r.lat).toBeCloseTo(50 + 47 / 60 + 7.2 / 3600, 12);
    expect(r.lon).toBeCloseTo(-(1 + 6 / 60 + 27 / 3600), 12);
  });

  it.each([
    ["50.78533 -1.1075", 50.78533, -1.1075],
    ["50.78533, -1.1075", 50.78533, -1.1075],
    ["50.78533,-1.1075", 50.78533, -1.1075],
    ["+50.78533 −1.1075", 50.78533, -1.1075],
    ["50.78533N 1.1075W", 50.78533, -1.1075],
    ["50.78533°N 1.1075°W", 50.78533, -1.1075],
    ["-33.5 151.25", -33.5, 151.25],
    ["33.5S 151.25E", -33.5, 151.25],
    ["50,78533 -1,1075", 50.78533, -1.1075], // decimal commas (no "." anywhere in the text)
    ["0 0", 0, 0],
    ["90N 180W", 90, -180],
  ])("DD %s", (text, lat, lon) => {
    const r = ok(text);
    expect(r.lat).toBeCloseTo(lat, 12);
    expect(r.lon).toBeCloseTo(lon, 12);
  });

  it("latitude first unless the text says otherwise", () => {
    expect(ok("10 20")).toMatchObject({ lat: 10, lon: 20 });
    // Hemisphere letters name the axes.
    expect(ok("001°06.45′W 50°47.12′N").lat).toBeCloseTo(LAT, 12);
    expect(ok("20E 10N")).toMatchObject({ lat: 10, lon: 20 });
    // Labels name the axes.
    expect(ok("lon 20 lat 10")).toMatchObject({ lat: 10, lon: 20 });
    expect(ok("lat=10, lon=20")).toMatchObject({ lat: 10, lon: 20 });
    expect(ok("longitude: -1.5 latitude: 50.25")).toMatchObject({ lat: 50.25, lon: -1.5 });
  });

  it("reads negative zero degrees with minutes as negative (-0°30′ = -0.5°)", () => {
    expect(ok("-0 30 -0 15")).toMatchObject({ lat: -0.5, lon: -0.25 });
  });

  it("throwing variant returns the same numbers", () => {
    expect(parsePositionOrThrow("50-47.12N 001-06.45W")).toEqual({ lat: ok("50-47.12N 001-06.45W").lat, lon: LON });
  });

  it("fast path and general parser agree on common forms", () => {
    for (const t of ["50°47.12′N 001°06.45′W", "50 47.12N 1 6.45W", "50-47.12N 001-06.45W", "50.78533 -1.1075", "55°12.30′S 003°01.10′E"]) {
      expect(parsePosition(t)).toEqual(parsePositionGeneral(t));
    }
  });
});

describe("parsePosition: every rejection message", () => {
  it("empty", () => {
    expect(bad("")).toMatchObject({ code: "empty", error: "Enter a position" });
    expect(bad("   ")).toMatchObject({ code: "empty" });
  });

  it("minutes ≥ 60", () => {
    expect(bad("50°60.00′N 001°06.45′W")).toMatchObject({ code: "minutes_out_of_range", error: "Minutes must be less than 60 (latitude: 60.00′)" });
    expect(bad("50-47.12N 001-61.5W")).toMatchObject({ code: "minutes_out_of_range", error: "Minutes must be less than 60 (longitude: 61.5′)" });
  });

  it("seconds ≥ 60", () => {
    expect(bad(`50°47'60"N 1°06'27"W`)).toMatchObject({ code: "seconds_out_of_range", error: "Seconds must be less than 60 (latitude: 60″)" });
    expect(bad(`50°47'07"N 1°06'75.5"W`)).toMatchObject({ code: "seconds_out_of_range", error: "Seconds must be less than 60 (longitude: 75.5″)" });
  });

  it("latitude beyond 90", () => {
    expect(bad("91°00.00′N 001°00.00′W")).toMatchObject({ code: "latitude_out_of_range", error: "Latitude 91° is beyond 90°" });
    expect(bad("-90.5 10")).toMatchObject({ code: "latitude_out_of_range", error: "Latitude 90.5° is beyond 90°" });
  });

  it("longitude beyond 180", () => {
    expect(bad("50N 181E")).toMatchObject({ code: "longitude_out_of_range", error: "Longitude 181° is beyond 180°" });
    expect(bad("10 -180.25")).toMatchObject({ code: "longitude_out_of_range", error: "Longitude 180.25° is beyond 180°" });
  });

  it("hemisphere letter on the wrong axis", () => {
    expect(bad("50N 1S")).toMatchObject({
      code: "wrong_axis",
      error: "Both values have latitude letters (N/S): the longitude needs E or W",
    });
    expect(bad("50E 1W")).toMatchObject({
      code: "wrong_axis",
      error: "Both values have longitude letters (E/W): the latitude needs N or S",
    });
    expect(bad("lat 50E lon 1")).toMatchObject({
      code: "wrong_axis",
      error: "Hemisphere letter E is for longitude but is labelled latitude",
    });
    expect(bad("lat 50 lat 1")).toMatchObject({ code: "wrong_axis", error: "Both values are labelled latitude" });
  });

  it("incomplete", () => {
    expect(bad("50.5")).toMatchObject({ code: "incomplete", error: "Give both latitude and longitude" });
    expect(bad("50°47.12′N")).toMatchObject({ code: "incomplete" });
    expect(bad("50N 1")).toMatchObject({
      code: "incomplete",
      error: "Give hemisphere letters for both latitude (N/S) and longitude (E/W), or use signs for both",
    });
    expect(bad("lat 50 1")).toMatchObject({ code: "incomplete", error: "Label both values (lat and lon), or neither" });
    expect(bad("N W")).toMatchObject({ code: "incomplete", error: "Give a latitude and a longitude" });
    expect(bad("50°47.12′ 1 6.45")).toMatchObject({ code: "incomplete", error: "Give both latitude and longitude, each with its degrees" });
  });

  it("ambiguous", () => {
    expect(bad("50 47 1 2 3")).toMatchObject({
      code: "ambiguous",
      error: "Cannot tell latitude from longitude in 5 numbers: use hemisphere letters, degree marks or a comma",
    });
    expect(bad("50N 1E 2W")).toMatchObject({ code: "ambiguous", error: "Too many hemisphere letters" });
    expect(bad("50, 1, 2")).toMatchObject({ code: "ambiguous", error: "Use one separator between latitude and longitude" });
    expect(bad("50 47 12 13N 1E")).toMatchObject({ code: "ambiguous", error: "Too many numbers in the latitude" });
    expect(bad("47′ 50°N 1°W")).toMatchObject({ code: "ambiguous", error: "The latitude has minutes without degrees" });
    expect(bad("50° 20′ 10°N 1°W")).toMatchObject({ code: "ambiguous", error: "Degrees, minutes and seconds are out of order in the latitude" });
    expect(bad("50°47″N 1°W")).toMatchObject({ code: "ambiguous", error: "The latitude has seconds without minutes" });
    expect(bad("50N 1E 5")).toMatchObject({ code: "ambiguous", error: "Unexpected text after the second hemisphere letter" });
    expect(bad("50 -30 1 6")).toMatchObject({ code: "ambiguous", error: "Only the degrees of the latitude may carry a sign" });
    expect(bad("50 lat 1 lon 2")).toMatchObject({ code: "ambiguous", error: "Put each lat/lon label before its value" });
    expect(bad("lat 1 lon 2 lat 3")).toMatchObject({ code: "ambiguous", error: "Too many lat/lon labels" });
    expect(bad("lat 50N N lon 1E")).toMatchObject({ code: "ambiguous", error: "Too many hemisphere letters" });
    expect(bad("5 50° 1°")).toMatchObject({ code: "ambiguous", error: "Start each value with its degrees" });
    expect(bad("50-47 1-6 3")).toMatchObject({ code: "ambiguous", error: "Give exactly two values (latitude and longitude)" });
    expect(bad("50-47")).toMatchObject({ code: "incomplete", error: "Give exactly two values (latitude and longitude)" });
    expect(bad("50° 1° 2°")).toMatchObject({ code: "ambiguous", error: "Too many degree values" });
    expect(bad("N W 1")).toMatchObject({ code: "incomplete", error: "The latitude has no value" });
    expect(bad("°50N 1E")).toMatchObject({ code: "ambiguous", error: "Unexpected degree mark in the latitude" });
  });

  it("fraction before minutes or seconds", () => {
    expect(bad("50.5°30′N 1°W")).toMatchObject({
      code: "fraction_before_minutes",
      error: "Degrees must be whole when minutes follow (latitude: 50.5°)",
    });
    expect(bad(`50°30.5'10"N 1°W`)).toMatchObject({
      code: "fraction_before_minutes",
      error: "Minutes must be whole when seconds follow (latitude: 30.5′)",
    });
  });

  it("sign together with a hemisphere letter", () => {
    expect(bad("-50N 1E")).toMatchObject({
      code: "sign_and_hemisphere",
      error: "Use either a minus sign or a hemisphere letter, not both (latitude)",
    });
  });

  it("unexpected characters", () => {
    expect(bad("fifty north")).toMatchObject({ code: "invalid_character", error: 'Unexpected "fifty"' });
    expect(bad("50# 1")).toMatchObject({ code: "invalid_character", error: 'Unexpected character "#"' });
    expect(bad("50.1.2 3")).toMatchObject({ code: "invalid_character", error: 'Unexpected "." after 50.1' });
    expect(bad("50 - 1")).toMatchObject({ code: "invalid_character", error: 'Unexpected "-"' });
  });

  it("too long", () => {
    expect(bad("5".repeat(201))).toMatchObject({ code: "too_long", error: "This position is too long" });
  });

  it("throwing variant throws PositionParseError with the code", () => {
    expect(() => parsePositionOrThrow("95N 1E")).toThrow(PositionParseError);
    try {
      parsePositionOrThrow("95N 1E");
    } catch (e) {
      expect((e as PositionParseError).code).toBe("latitude_out_of_range");
    }
  });
});

describe("formatPosition", () => {
  it("DDM with leading zeros and a chosen precision", () => {
    expect(formatPosition(LAT, LON, "ddm", { decimals: 2 })).toBe("50°47.12′N 001°06.45′W");
    expect(formatPosition(LAT, LON, "ddm")).toBe("50°47.120′N 001°06.450′W");
    expect(formatPosition(LAT, LON, "ddm", { decimals: 2, marks: "ascii" })).toBe("50 47.12N 001 06.45W");
    expect(formatPosition(-5.5, 3.25, "ddm", { decimals: 1 })).toBe("05°30.0′S 003°15.0′E");
  });

  it("broadcast form: DD-MM.mmN DDD-MM.mmW, 0.01′ at most, same precision both axes (MSC.1/Circ.1310 §5.5)", () => {
    expect(formatPosition(LAT, LON, "broadcast")).toBe("50-47.12N 001-06.45W");
    expect(formatPosition(LAT, LON, "broadcast", { decimals: 1 })).toBe("50-47.1N 001-06.5W");
    expect(formatPosition(LAT, LON, "broadcast", { decimals: 0 })).toBe("50-47N 001-06W");
    expect(() => formatPosition(LAT, LON, "broadcast", { decimals: 3 })).toThrow(/at most 0.01′/);
  });

  it("DMS and DD", () => {
    expect(formatPosition(50 + 47 / 60 + 7.2 / 3600, -(1 + 6 / 60 + 27 / 3600), "dms")).toBe("50°47′07.2″N 001°06′27.0″W");
    expect(formatPosition(50 + 47 / 60 + 7.2 / 3600, -(1 + 6 / 60 + 27 / 3600), "dms", { marks: "ascii", decimals: 0 })).toBe("50 47 07N 001 06 27W");
    expect(formatPosition(50.785333, -1.1075, "dd")).toBe("50.78533°N 1.10750°W");
    expect(formatPosition(50.785333, -1.1075, "dd", { signed: true, decimals: 4 })).toBe("50.7853, -1.1075");
  });

  it("carries rounding into the next degree and never prints a negative zero", () => {
    expect(formatPosition(59.9999999, 179.9999999, "broadcast")).toBe("60-00.00N 180-00.00E");
    expect(formatPosition(-0.0000001, -0.0000001, "ddm")).toBe("00°00.000′N 000°00.000′E");
    expect(formatPosition(-0.0000001, -0.0000001, "dd", { signed: true })).toBe("0.00000, 0.00000");
  });

  it("refuses impossible positions and precisions", () => {
    expect(() => formatPosition(91, 0)).toThrow(RangeError);
    expect(() => formatPosition(0, 0, "ddm", { decimals: -1 })).toThrow(RangeError);
  });

  it("formatAll and bearings", () => {
    expect(formatAll(LAT, LON)).toEqual({
      dd: "50.78533°N 1.10750°W",
      ddm: "50°47.120′N 001°06.450′W",
      dms: "50°47′07.2″N 001°06′27.0″W",
      broadcast: "50-47.12N 001-06.45W",
    });
    expect(formatBearingTrue(47)).toBe("047°T");
    expect(formatBearingTrue(359.6)).toBe("000°T");
  });
});

describe("parseProjectedPair", () => {
  it.each([
    ["651409.903 313177.270"],
    ["651409.903, 313177.270"],
    ["651409.903m 313177.270m"],
    ["E 651409.903 N 313177.270"],
    ["651409.903E 313177.270N"],
    ["N 313177.270 E 651409.903"],
    ["313177.270N 651409.903E"],
  ])("%s", (text) => {
    expect(parseProjectedPair(text)).toEqual({ ok: true, easting: 651409.903, northing: 313177.27 });
  });

  it("negative values are allowed (false origin)", () => {
    expect(parseProjectedPair("-1200.5 -3")).toEqual({ ok: true, easting: -1200.5, northing: -3 });
  });

  it("every rejection message", () => {
    expect(parseProjectedPair("")).toMatchObject({ ok: false, code: "empty", error: "Enter an easting and a northing" });
    expect(parseProjectedPair("651409")).toMatchObject({ ok: false, code: "incomplete", error: "Give both an easting and a northing" });
    expect(parseProjectedPair("1 2 3")).toMatchObject({ ok: false, code: "ambiguous", error: "Give exactly two numbers: easting and northing" });
    expect(parseProjectedPair("E 1 2")).toMatchObject({ ok: false, code: "incomplete", error: "Mark both numbers with E/N, or neither" });
    expect(parseProjectedPair("E 1 E 2")).toMatchObject({ ok: false, code: "ambiguous", error: "Both numbers are marked E" });
    expect(parseProjectedPair("E 1 N 2 E")).toMatchObject({ ok: false, code: "ambiguous", error: "Too many E/N letters" });
    expect(parseProjectedPair("200000000 2")).toMatchObject({ ok: false, code: "ambiguous", error: "Easting and northing must be metres within ±100,000,000" });
    expect(parseProjectedPair("abc 1")).toMatchObject({ ok: false, code: "invalid_character", error: 'Unexpected text "abc 1": give an easting and a northing in metres' });
    expect(parseProjectedPair("1".repeat(201))).toMatchObject({ ok: false, code: "too_long" });
  });
});
