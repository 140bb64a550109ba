// Demo discrepancy reports (DEMO.md story 1 and a few others), all invented. After a gale the
// fishing skipper sees channel buoy KS3 on radar 0.08 M east of its charted position; the ferry
// skipper, alongside it, agrees by GNSS. The assessment is computed with the same engine as the
// app (relative imports: seeds run outside the app's module aliases).
import type { Knex } from "knex";
import { assess } from "../app/lib/geo/assessment";
import { direct, inverse } from "../app/lib/geo/geodesy";
import { formatPosition } from "../app/lib/geo/positions";
import { assessmentInputFor } from "../app/lib/reports/schema";

type AidRow = { id: number; harbour_id: number; code: string; lat: number; lon: number; charted_position_text: string; charted_crs: string; chain_length_m: string | null; depth_m: string | null; swing_radius_m: string | null };

const HOUR_MS = 3600_000;
const dd = (lat: number, lon: number) => formatPosition(lat, lon, "dd", { decimals: 6 });

export async function seed(knex: Knex) {
  const aids = new Map<string, AidRow>((await knex("aids").select("*")).map((a: AidRow) => [a.code, a]));
  const users = new Map<string, { id: number; name: string; email: string }>((await knex("users").select("id", "name", "email")).map((u: { id: number; name: string; email: string }) => [u.email, u]));
  const officer = users.get("officer@kestrel-sound.example");
  const asAid = (a: AidRow) => ({
    chartedPositionText: a.charted_position_text,
    chartedCrs: a.charted_crs,
    chainLengthM: a.chain_length_m === null ? null : Number(a.chain_length_m),
    depthM: a.depth_m === null ? null : Number(a.depth_m),
    swingRadiusM: a.swing_radius_m === null ? null : Number(a.swing_radius_m),
  });

  type Seed = {
    aid?: string;
    hazard?: string;
    observation: Record<string, unknown>;
    hoursAgo: number;
    reporter: string;
    vessel: string;
    remarks: string;
    status?: "new" | "acknowledged" | "closed";
    /** The true position the observation was made of (for hazards: their position). */
  };

  const ks3 = aids.get("KS3");
  const gannet = aids.get("GANNET-S");
  const tern = aids.get("TERN-W");
  if (!ks3 || !gannet || !tern) return; // the harbour seed did not run
  // Where KS3 really is after the gale: 0.08 M (148.16 m) east of its charted WGS 84 position.
  const ks3Real = direct(ks3.lat, ks3.lon, 90, 0.08 * 1852);
  // The fishing boat 0.6 M south-west of it, reading range and bearing on the 1.5 M scale.
  const fishing = direct(ks3Real.lat, ks3Real.lon, 225, 0.6 * 1852);
  const fix = inverse(fishing.lat, fishing.lon, ks3Real.lat, ks3Real.lon);
  const ferryFix = direct(ks3Real.lat, ks3Real.lon, 300, 6); // alongside, 6 m off
  const gannetSeen = direct(gannet.lat, gannet.lon, 45, 0.15 * 1852);
  const container = direct(tern.lat, tern.lon, 200, 0.4 * 1852);
  const kayakOwn = direct(container.lat, container.lon, 20, 120);

  const seeds: Seed[] = [
    {
      aid: "KS3",
      observation: {
        method: "radar",
        ownPosition: dd(fishing.lat, fishing.lon),
        rangeNm: Number((fix.distanceM / 1852).toFixed(3)),
        bearingDeg: Math.round(fix.initialBearingTrueDeg),
        bearingRef: "true",
        rangeScaleNm: 1.5,
      },
      hoursAgo: 5,
      reporter: "fishing@boaters.example",
      vessel: "FV Northern Tern",
      remarks: "After the gale. KS3 looks well east of the line of the channel on radar; light working.",
    },
    {
      aid: "KS3",
      observation: { method: "gnss", position: dd(ferryFix.lat, ferryFix.lon) },
      hoursAgo: 3,
      reporter: "ferry@boaters.example",
      vessel: "MV Skerrow Maid",
      remarks: "Passed close to KS3 on the morning crossing; plotter put us east of the charted mark.",
    },
    {
      aid: "GANNET-S",
      observation: { method: "compass", ownPosition: dd(gannetSeen.lat, gannetSeen.lon), bearingMagneticDeg: 226, distanceM: 280 },
      hoursAgo: 26,
      reporter: "sailing@boaters.example",
      vessel: "Sailing school RIB Kestrel 2",
      remarks: "Gannet South seemed closer to the bank than usual. Hand-bearing compass, distance estimated.",
      status: "acknowledged",
    },
    {
      hazard: "Half-submerged shipping container, drifting slowly south",
      observation: { method: "compass", ownPosition: dd(kayakOwn.lat, kayakOwn.lon), bearingMagneticDeg: 200, distanceM: 120 },
      hoursAgo: 8,
      reporter: "kayak@boaters.example",
      vessel: "Skerrow Sea Kayaks, guided group",
      remarks: "About 6 m long, only the top showing. We kept well clear.",
    },
  ];

  for (const s of seeds) {
    const user = users.get(s.reporter);
    const observedAt = new Date(Date.now() - s.hoursAgo * HOUR_MS);
    const observation = { ...s.observation, observedAt: observedAt.toISOString() };
    const aid = s.aid ? aids.get(s.aid)! : null;
    const result = aid
      ? assess(assessmentInputFor(asAid(aid), [observation]))
      : assess({ charted: { position: { lat: 0, lon: 0 } }, swingRadiusM: 0, observations: [observation] });
    const obs = result.observations[0]!;
    const [id] = await knex("reports").insert({
      harbour_id: aid?.harbour_id ?? tern.harbour_id,
      aid_id: aid?.id ?? null,
      hazard_description: s.hazard ?? null,
      observation_method: s.observation.method,
      observation_json: JSON.stringify(observation),
      observed_at: observedAt,
      remarks: s.remarks,
      reporter_user_id: user?.id ?? null,
      reporter_email: s.reporter,
      reporter_name: user?.name ?? null,
      // The demo accounts' names already carry the boat, e.g. "Declan Faulds (FV Northern Tern)".
      reporter_vessel: user?.name.includes(s.vessel) ? null : s.vessel,
      status: s.status ?? "new",
      observed_lat: obs.lat,
      observed_lon: obs.lon,
      uncertainty_m: obs.uncertaintyM,
      verdict: aid ? result.verdict : null,
      displacement_m: aid ? result.displacement.distanceM : null,
      displacement_bearing_deg: aid ? result.displacement.bearingTrueDeg : null,
      assessment_json: aid ? JSON.stringify(result) : null,
      created_at: new Date(observedAt.getTime() + 20 * 60_000),
      updated_at: new Date(observedAt.getTime() + 20 * 60_000),
    });
    await knex("report_events").insert({ report_id: id, from_status: null, to_status: "new", note: "Report received", actor_user_id: user?.id ?? null, created_at: new Date(observedAt.getTime() + 20 * 60_000) });
    if (s.status === "acknowledged") {
      await knex("report_events").insert({ report_id: id, from_status: "new", to_status: "acknowledged", note: "We will check it at the next buoy inspection.", actor_user_id: officer?.id ?? null });
    }
  }
}
