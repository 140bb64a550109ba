// The pure parts of a report: the form → API mapping, error field mapping, EXIF checks, and the
// harbour-time conversion of a datetime-local value.
import { describe, expect, it } from "vitest";
import { canTransition, formFieldFor, photoMismatches, reportSubmissionSchema, submissionFromForm, typedOwnPosition } from "~/lib/reports/schema";
import { isoToZonedLocal, zonedLocalToIso } from "~/lib/reports/time";

describe("report form mapping", () => {
  it("takes only the chosen method's fields, numbers as numbers, and drops the heading for a true bearing", () => {
    const s = submissionFromForm(
      { target: "aid", aidId: "12", method: "radar", "radar.ownPosition": "55°11.1′N 003°00.2′E", "radar.rangeNm": "0,6", "radar.bearingDeg": "045°", "radar.bearingRef": "true", "radar.headingTrueDeg": "10", "radar.rangeScaleNm": "1.5", "gnss.position": "ignored", observedAtIso: "2026-11-30T14:05:00.000Z", reporterEmail: " a@b.example " },
      ["u1"],
    );
    expect(s).toEqual({
      aid: 12,
      observation: { method: "radar", ownPosition: "55°11.1′N 003°00.2′E", rangeNm: 0.6, bearingDeg: 45, bearingRef: "true", rangeScaleNm: 1.5 },
      observedAt: "2026-11-30T14:05:00.000Z",
      reporter: { email: "a@b.example" },
      photoUploadIds: ["u1"],
    });
  });
  it("keeps junk numbers as text so the engine names the field", () => {
    const s = submissionFromForm({ method: "compass", "compass.distanceM": "about 200" }, []);
    expect((s.observation as Record<string, unknown>).distanceM).toBe("about 200");
  });
  it("maps API error paths onto form fields", () => {
    expect(formFieldFor("observation.rangeNm", "radar")).toBe("radar.rangeNm");
    expect(formFieldFor("observations.0.position", "gnss")).toBe("gnss.position");
    expect(formFieldFor("reporter.email", "radar")).toBe("reporterEmail");
    expect(formFieldFor("charted.position", "radar")).toBe("aidId");
    expect(formFieldFor("photoUploadIds", "radar")).toBe("photos");
  });
  it("refuses a report with neither aid nor hazard, and one with both", () => {
    const base = { observation: { method: "gnss", position: "55°N 3°E" }, observedAt: new Date(Date.now() - 60_000).toISOString() };
    expect(reportSubmissionSchema.safeParse(base).error?.issues[0]?.message).toMatch(/Choose the aid/);
    expect(reportSubmissionSchema.safeParse({ ...base, aid: "KS3", hazard: { description: "rock" } }).error?.issues[0]?.message).toMatch(/not both/);
  });
});

describe("EXIF against what was typed", () => {
  it("flags a photo taken far away or long before; passes one taken alongside", () => {
    const own = typedOwnPosition({ method: "radar", ownPosition: "55°11.000′N 003°00.000′E" })!;
    const flags = photoMismatches(
      [
        { lat: own.lat + 0.0001, lon: own.lon, takenAt: "2026-11-30T14:10:00Z" },
        { lat: own.lat + 0.05, lon: own.lon, takenAt: "2026-11-30T10:00:00Z" },
        { lat: null, lon: null, takenAt: null },
      ],
      own,
      "2026-11-30T14:05:00Z",
    );
    // 0.05° of latitude ≈ 5.6 km.
    expect(flags).toEqual(["Photo 2 was taken 5.6 km from the own position given (its GPS tag).", "Photo 2 was taken 4 h before the observation time given (its EXIF time)."]);
  });
});

describe("harbour time", () => {
  it("reads datetime-local values in Europe/London, winter and summer", () => {
    expect(zonedLocalToIso("2026-11-30T14:05", "Europe/London")).toBe("2026-11-30T14:05:00.000Z");
    expect(zonedLocalToIso("2026-07-01T14:05", "Europe/London")).toBe("2026-07-01T13:05:00.000Z"); // BST = UTC+1
    expect(isoToZonedLocal("2026-07-01T13:05:00Z", "Europe/London")).toBe("2026-07-01T14:05");
    expect(zonedLocalToIso("2026-13-01T10:00", "Europe/London")).toBeNull();
  });
});

describe("triage states", () => {
  it("new → acknowledged → confirmed → closed; no way back, nothing after closed", () => {
    expect(canTransition("new", "acknowledged")).toBe(true);
    expect(canTransition("acknowledged", "confirmed")).toBe(true);
    expect(canTransition("confirmed", "closed")).toBe(true);
    expect(canTransition("acknowledged", "new")).toBe(false);
    expect(canTransition("new", "closed")).toBe(false);
    expect(canTransition("closed", "acknowledged")).toBe(false);
  });
});
