// Demo notices for Kestrel Sound (invented; DEMO.md stories 2–5 and a few more), written through
// the same form parser and model as the staff editor, so numbering, audit trail and geometry are
// exactly what the app produces. Positions are typed in ED50 (older charts), WGS 84 and
// ED50 / UTM zone 31N. Story 1 (KS3 off position) is left for the reports flow.
import type { Knex } from "knex";
import { fromWgs84, isGeographicCoord } from "../app/lib/geo/crs";
import { formatPosition } from "../app/lib/geo/positions";
import { parseNoticeForm } from "../app/lib/notices/schema";
import { cancelNotice, createDraft, createSupersedingDraft, expireDueNotices, publishNotice, updateNotice } from "../app/models/notice.server";
import { DEMO_AIDS } from "./02_harbour";

type LatLon = [number, number];
const ZONE = "Europe/London";

/** Positions as an officer would type them off a chart in that datum (WGS 84 truth in, text out). */
function typed(crs: string, pts: LatLon[]): string {
  return pts
    .map(([lat, lon]) => {
      const c = fromWgs84(crs, lat, lon);
      if (isGeographicCoord(c)) return formatPosition(c.lat, c.lon, "ddm", { decimals: 2 });
      return `${c.easting.toFixed(0)} ${c.northing.toFixed(0)}`;
    })
    .join("\n");
}

function aidAt(code: string): LatLon {
  const a = DEMO_AIDS.find((x) => x.code === code)!;
  return [a.at.lat, a.at.lon];
}

function input(f: Record<string, string | string[]>) {
  const r = parseNoticeForm({ generalArea: "NORTH SEA", urgency: "routine", ...f }, ZONE);
  if (!r.ok) throw new Error(`seed notice "${f.title}" invalid: ${JSON.stringify(r.errors)}`);
  return r.data;
}

export async function seed(knex: Knex) {
  const harbour = (await knex("harbours").where({ slug: "kestrel-sound" }).first("id")) as { id: number } | undefined;
  if (!harbour) return;
  const users = (await knex("users").whereIn("role", ["harbourmaster", "officer"]).orderBy("id").select("id", "role")) as { id: number; role: string }[];
  const hm = users.find((u) => u.role === "harbourmaster")!;
  const officer = users.find((u) => u.role === "officer") ?? hm;
  const aidIds = Object.fromEntries(((await knex("aids").where({ harbour_id: harbour.id }).select("id", "code")) as { id: number; code: string }[]).map((a) => [a.code, String(a.id)]));
  const at = (s: string) => new Date(s);
  const draft = (f: Record<string, string | string[]>, when: string) => createDraft(harbour.id, input(f), officer, { at: at(when) }, knex);
  const publish = async (f: Record<string, string | string[]>, drafted: string, published: string) => {
    const d = await draft(f, drafted);
    return publishNotice(d.id, d.version, hm, { at: at(published) }, knex);
  };

  // Story 1 (earlier, closed): KS5 off position in March, cancelled when relaid.
  const ks5 = await publish(
    {
      title: "KS5 buoy off position",
      generalType: "aids_to_navigation_changes",
      detailTypes: ["51"],
      urgency: "urgent",
      validFrom: "2026-03-10T07:30",
      untilFurtherNotice: "on",
      locality: "Kestrel Sound, approach channel",
      charts: "KS 101",
      body: "Starboard-hand buoy KS5 reported about 60 metres east of its charted position after a gale. Mariners are advised to navigate with caution.",
      aidIds: [aidIds.KS5!],
      "parts.0.kind": "point",
      "parts.0.crs": "EPSG:4326",
      "parts.0.positions": typed("EPSG:4326", [aidAt("KS5")]),
    },
    "2026-03-10T07:00:00Z",
    "2026-03-10T07:20:00Z",
  );
  await cancelNotice(ks5.id, ks5.version, "Buoy KS5 relaid on its charted position by the harbour launch on 18 March 2026.", hm, { at: at("2026-03-18T15:00:00Z") }, knex);

  // Story 4a: a missing light, cancelled when restored (positions from an ED50 chart).
  const haddock = await publish(
    {
      title: "Haddock Ledge north cardinal beacon light unlit",
      generalType: "aids_to_navigation_changes",
      detailTypes: ["170"],
      validFrom: "2026-08-20T09:00",
      untilFurtherNotice: "on",
      locality: "Skerrow Island, Haddock Ledge",
      charts: "KS 100",
      body: "The light of Haddock Ledge north cardinal beacon (VQ) is reported unlit. The beacon is in place.",
      aidIds: [aidIds["HADDOCK-N"]!],
      "parts.0.kind": "point",
      "parts.0.crs": "EPSG:4230",
      "parts.0.positions": typed("EPSG:4230", [aidAt("HADDOCK-N")]),
    },
    "2026-08-20T08:00:00Z",
    "2026-08-20T08:30:00Z",
  );
  await cancelNotice(haddock.id, haddock.version, "Light restored and checked by the harbour launch on 2 September 2026.", hm, { at: at("2026-09-02T14:10:00Z") }, knex);

  // Story 4b: an uncharted rock, superseded two days later by a corrected position.
  const rock = await publish(
    {
      title: "Uncharted rock reported south of Tern Rocks",
      generalType: "newly_discovered_dangers",
      detailTypes: ["277"],
      urgency: "urgent",
      validFrom: "2026-09-10T11:00",
      untilFurtherNotice: "on",
      locality: "Skerrow Island, south of Tern Rocks",
      charts: "KS 100",
      body: "A rock with about 1.8 metres over it at low water is reported. Mariners are advised to give the area a wide berth.",
      "parts.0.kind": "point",
      "parts.0.crs": "EPSG:4326",
      "parts.0.positions": typed("EPSG:4326", [[55.2118, 3.0185]]),
    },
    "2026-09-10T10:00:00Z",
    "2026-09-10T10:30:00Z",
  );
  const rockFix = await createSupersedingDraft(rock.id, hm, { at: at("2026-09-12T08:00:00Z") }, knex);
  const rockFixed = await updateNotice(
    rockFix.id,
    rockFix.version,
    input({
      title: "Uncharted rock south of Tern Rocks (corrected position)",
      generalType: "newly_discovered_dangers",
      detailTypes: ["277"],
      urgency: "urgent",
      positionStatus: "located",
      validFrom: "2026-09-12T09:00",
      untilFurtherNotice: "on",
      locality: "Skerrow Island, south of Tern Rocks",
      charts: "KS 100",
      body: "The position reported in the earlier notice was 150 metres in error. A survey found the rock with 1.6 metres over it at low water.",
      "parts.0.kind": "point",
      "parts.0.crs": "EPSG:4326",
      "parts.0.positions": typed("EPSG:4326", [[55.2108, 3.0168]]),
    }),
    hm,
    { at: at("2026-09-12T08:20:00Z") },
    knex,
  );
  await publishNotice(rockFix.id, rockFixed.version, hm, { at: at("2026-09-12T08:30:00Z") }, knex);

  // Story 5: a wreck, first marked by an emergency wreck marking buoy, then by an isolated danger mark.
  const wreck = await publish(
    {
      title: "Dangerous wreck Marlin marked by an emergency wreck marking buoy",
      generalType: "newly_discovered_dangers",
      detailTypes: ["73"],
      urgency: "urgent",
      validFrom: "2026-10-03T06:00",
      untilFurtherNotice: "on",
      locality: "Kestrel Sound, west of the fairway",
      charts: "KS 101",
      body: "Fishing vessel Marlin sank in about 14 metres. Least depth over the wreck 6 metres. Emergency wreck marking buoy (blue and yellow, Al.Bu.Y) laid close west. Give a wide berth.",
      aidIds: [aidIds["MARLIN-EWM"]!],
      "parts.0.kind": "point",
      "parts.0.crs": "EPSG:4326",
      "parts.0.positions": typed("EPSG:4326", [[55.1978, 2.9902]]),
    },
    "2026-10-03T05:30:00Z",
    "2026-10-03T05:45:00Z",
  );
  const wreck2 = await createSupersedingDraft(wreck.id, hm, { at: at("2026-10-20T09:00:00Z") }, knex);
  const wreck2Edited = await updateNotice(
    wreck2.id,
    wreck2.version,
    input({
      title: "Dangerous wreck Marlin now marked by an isolated danger buoy",
      generalType: "newly_discovered_dangers",
      detailTypes: ["73"],
      validFrom: "2026-10-20T10:00",
      untilFurtherNotice: "on",
      positionStatus: "located",
      locality: "Kestrel Sound, west of the fairway",
      charts: "KS 101",
      body: "The emergency wreck marking buoy has been withdrawn. The wreck is now marked by isolated danger buoy Marlin, Fl(2) 5s. Least depth 6 metres.",
      aidIds: [aidIds.MARLIN!],
      "parts.0.kind": "point",
      "parts.0.crs": "EPSG:4326",
      "parts.0.positions": typed("EPSG:4326", [[55.1978, 2.9902]]),
    }),
    hm,
    { at: at("2026-10-20T09:30:00Z") },
    knex,
  );
  await publishNotice(wreck2.id, wreck2Edited.version, hm, { at: at("2026-10-20T10:00:00Z") }, knex);

  // Story 3: the regatta, a circle of 0.5 M for one afternoon, then expired on its own.
  await publish(
    {
      title: "Kestrel Sound Autumn Regatta",
      generalType: "special_operations",
      detailTypes: ["235"],
      restrictions: ["13"],
      validFrom: "2026-10-17T12:00",
      validUntil: "2026-10-17T17:00",
      locality: "Kestrel Sound, north of the fairway",
      body: "Sailing races within the circle. Keep clear of racing yachts and follow the instructions of the safety boats on VHF channel 72.",
      "parts.0.kind": "circle",
      "parts.0.crs": "EPSG:4326",
      "parts.0.positions": typed("EPSG:4326", [[55.19, 3.0]]),
      "parts.0.radiusNm": "0.5",
    },
    "2026-10-10T09:00:00Z",
    "2026-10-12T09:00:00Z",
  );
  await expireDueNotices(at("2026-10-17T16:01:00Z"), knex);

  // A diving operation in November that ran its course.
  await publish(
    {
      title: "Diving operations at Gannet Bank",
      generalType: "special_operations",
      detailTypes: ["87"],
      restrictions: ["1", "27"],
      validFrom: "2026-11-02T08:00",
      validUntil: "2026-11-06T17:00",
      locality: "Kestrel Sound, Gannet Bank",
      body: "Divers working from the survey vessel Skua, displaying the international code flag A. Keep clear and pass at slow speed.",
      "parts.0.kind": "circle",
      "parts.0.crs": "EPSG:4230",
      "parts.0.positions": typed("EPSG:4230", [[55.1922, 3.035]]),
      "parts.0.radiusNm": "0.2",
    },
    "2026-10-28T09:00:00Z",
    "2026-10-29T09:00:00Z",
  );
  await expireDueNotices(at("2026-11-06T17:01:00Z"), knex);

  // Story 2: dredging of the inner basin for three weeks, typed in ED50, ending on its own.
  await publish(
    {
      title: "Dredging operations in the inner basin",
      generalType: "works",
      detailTypes: ["89"],
      restrictions: ["1", "27"],
      validFrom: "2026-11-23T07:00",
      validUntil: "2026-12-14T18:00",
      locality: "Kestrel Sound, inner basin",
      charts: "KS 102",
      body: "Cutter-suction dredger Kittiwake and attendant craft working in the inner basin, day and night. Anchoring prohibited; maximum speed 4 knots. Pass the dredger on the side showing two green lights.",
      "parts.0.kind": "area",
      "parts.0.crs": "EPSG:4230",
      "parts.0.positions": typed("EPSG:4230", [
        [55.2098, 3.0368],
        [55.2102, 3.0442],
        [55.2064, 3.0446],
        [55.2058, 3.0362],
      ]),
    },
    "2026-11-16T10:00:00Z",
    "2026-11-18T10:00:00Z",
  );

  // Fish farm special mark unlit (the register shows FARM-NW unlit).
  await publish(
    {
      title: "Skerrow fish farm NW special mark light unlit",
      generalType: "aids_to_navigation_changes",
      detailTypes: ["153"],
      validFrom: "2026-11-25T16:00",
      untilFurtherNotice: "on",
      locality: "Skerrow Island, fish farm",
      charts: "KS 100",
      body: "The light of the north-west special mark of the fish farm (Fl Y 5s) is unlit. Repair expected within two weeks.",
      aidIds: [aidIds["FARM-NW"]!],
      "parts.0.kind": "point",
      "parts.0.crs": "EPSG:4326",
      "parts.0.positions": typed("EPSG:4326", [aidAt("FARM-NW")]),
    },
    "2026-11-25T15:30:00Z",
    "2026-11-25T15:45:00Z",
  );

  // Cable laying along a line, positions typed as ED50 / UTM 31N grid coordinates.
  await publish(
    {
      title: "Cable laying north of Skerrow Island",
      generalType: "works",
      detailTypes: ["64"],
      restrictions: ["1", "3"],
      validFrom: "2026-11-30T06:00",
      validUntil: "2026-12-20T18:00",
      locality: "Skerrow Island, north coast",
      charts: "KS 100",
      body: "Cable ship Fulmar laying a power cable along the line below, restricted in her ability to manoeuvre. Keep 500 metres clear. No anchoring or fishing within 0.25 M of the line.",
      "parts.0.kind": "line",
      "parts.0.crs": "EPSG:23031",
      "parts.0.positions": typed("EPSG:23031", [
        [55.231, 3.03],
        [55.236, 3.06],
        [55.238, 3.1],
        [55.245, 3.15],
      ]),
    },
    "2026-11-27T09:00:00Z",
    "2026-11-27T12:00:00Z",
  );

  // Hydrographic survey in the approach channel, an area in WGS 84, urgent for small craft.
  await publish(
    {
      title: "Hydrographic survey in the approach channel",
      generalType: "special_operations",
      detailTypes: ["146"],
      restrictions: ["28"],
      urgency: "urgent",
      validFrom: "2026-12-01T07:00",
      validUntil: "2026-12-05T16:00",
      locality: "Kestrel Sound, approach channel",
      charts: "KS 101",
      body: "Survey launch Tern running lines across the approach channel, towing equipment. Overtaking in the channel prohibited while the launch is working. Listen on VHF channel 14.",
      "parts.0.kind": "area",
      "parts.0.crs": "EPSG:4326",
      "parts.0.positions": typed("EPSG:4326", [
        [55.1895, 3.0075],
        [55.2045, 3.0335],
        [55.2025, 3.0375],
        [55.1875, 3.0115],
      ]),
    },
    "2026-11-30T15:00:00Z",
    "2026-11-30T16:00:00Z",
  );

  // A draft the harbourmaster has yet to publish.
  await draft(
    {
      title: "Temporary buoyage at the fish farm",
      generalType: "aids_to_navigation_changes",
      detailTypes: ["273"],
      validFrom: "2026-12-03T08:00",
      validUntil: "2026-12-17T17:00",
      locality: "Skerrow Island, fish farm",
      body: "Two temporary special marks (yellow, Fl Y 2.5s) laid while the farm's moorings are replaced.",
      "parts.0.kind": "area",
      "parts.0.crs": "EPSG:4326",
      "parts.0.positions": typed("EPSG:4326", [
        [55.218, 3.1105],
        [55.218, 3.1185],
        [55.213, 3.1185],
        [55.213, 3.1105],
      ]),
    },
    "2026-11-30T17:00:00Z",
  );
}
