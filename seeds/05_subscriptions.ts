// Demo subscribers (DEMO.md): the yacht club, the fishing co-operative, the ferry operator and a
// dive centre, each with its own area and cadence, already confirmed. Invented addresses.
import type { Knex } from "knex";
import { parseArea, type SubscriptionArea } from "../app/lib/subscriptions/area";
import type { DigestSchedule } from "../app/lib/subscriptions/schedule";
import { createConfirmedSubscription, getHarbourForMail } from "../app/models/subscription.server";

type DemoSubscriber = { email: string; label: string; area: SubscriptionArea; types: string[]; urgentAlerts: boolean; digest: DigestSchedule };

export const DEMO_SUBSCRIBERS: DemoSubscriber[] = [
  {
    email: "notices@kestrel-yacht-club.example",
    label: "Kestrel Sound Yacht Club",
    // The approach channel, the harbour mouth and the inner basin.
    area: parseArea({ areaKind: "polygon", polygon: "55°13.00′N 002°58.50′E\n55°13.00′N 003°03.00′E\n55°11.50′N 003°03.00′E\n55°10.80′N 002°58.50′E" }),
    types: [],
    urgentAlerts: true,
    digest: { cadence: "daily", localTime: "18:00", weekday: null },
  },
  {
    email: "office@skerrow-fishing-coop.example",
    label: "Skerrow Fishing Co-operative",
    area: { kind: "harbour" },
    types: [],
    urgentAlerts: true,
    digest: { cadence: "weekly", localTime: "05:30", weekday: 1 },
  },
  {
    // The ferry skipper's account address, so the subscription shows under /account/subscriptions.
    email: "ferry@boaters.example",
    label: "Skerrow Ferry Company",
    area: parseArea({ areaKind: "circle", centre: "55°12.30′N 003°02.04′E", radiusNm: "1.5" }),
    types: ["aids_to_navigation_changes", "newly_discovered_dangers", "drifting_hazards", "routeing_change"],
    urgentAlerts: true,
    digest: { cadence: "none", localTime: null, weekday: null },
  },
  {
    email: "bookings@marlin-dive-centre.example",
    label: "Marlin Dive Centre",
    // Around the Marlin wreck.
    area: parseArea({ areaKind: "circle", centre: "55°11.88′N 002°59.40′E", radiusNm: "0.5" }),
    types: [],
    urgentAlerts: false,
    digest: { cadence: "daily", localTime: "07:00", weekday: null },
  },
];

export async function seed(knex: Knex) {
  const row = (await knex("harbours").where({ slug: "kestrel-sound" }).first("id")) as { id: number } | undefined;
  if (!row) return;
  const harbour = (await getHarbourForMail(row.id, knex))!;
  await knex("subscriptions").whereIn("email", DEMO_SUBSCRIBERS.map((s) => s.email)).delete();
  // Confirmed in mid-October (demo time line), so the first digest and the staff preview cover
  // the autumn's notices; the worker sends that catch-up digest once, then keeps the schedule.
  const confirmedAt = new Date("2026-10-15T08:00:00Z");
  for (const s of DEMO_SUBSCRIBERS) {
    const user = (await knex("users").where({ email: s.email }).first("id")) as { id: number } | undefined;
    await createConfirmedSubscription(
      { email: s.email, userId: user?.id ?? null, harbourId: harbour.id, area: s.area, generalTypes: s.types, urgentAlerts: s.urgentAlerts, digest: s.digest, label: s.label },
      harbour,
      confirmedAt,
      knex,
    );
  }
}
