/**
 * IALA Maritime Buoyage System categories: labels, the light colour and default light
 * characteristics for each (IALA MBS as summarised in ../shared/TRADE.md; the periods where
 * TRADE.md gives none — isolated danger 5 s, special mark Fl Y 5s — are common practice).
 */
import type { Colour, LightCharacteristic } from "./light";

export const IALA_CATEGORIES = [
  "port",
  "starboard",
  "preferred_channel_port",
  "preferred_channel_starboard",
  "north_cardinal",
  "east_cardinal",
  "south_cardinal",
  "west_cardinal",
  "isolated_danger",
  "safe_water",
  "special",
  "emergency_wreck",
] as const;
export type IalaCategory = (typeof IALA_CATEGORIES)[number];
export type IalaRegion = "A" | "B";

export const IALA_CATEGORY_LABELS: Record<IalaCategory, string> = {
  port: "Lateral, port hand",
  starboard: "Lateral, starboard hand",
  preferred_channel_port: "Preferred channel to port",
  preferred_channel_starboard: "Preferred channel to starboard",
  north_cardinal: "North cardinal",
  east_cardinal: "East cardinal",
  south_cardinal: "South cardinal",
  west_cardinal: "West cardinal",
  isolated_danger: "Isolated danger",
  safe_water: "Safe water",
  special: "Special mark",
  emergency_wreck: "Emergency wreck marking buoy",
};

export const AID_TYPES = ["buoy", "beacon", "light"] as const;
export type AidType = (typeof AID_TYPES)[number];
export const AID_TYPE_LABELS: Record<AidType, string> = { buoy: "Buoy", beacon: "Beacon", light: "Light" };

export const AID_STATUSES = ["operating", "unlit", "damaged", "off_station", "missing", "withdrawn"] as const;
export type AidStatus = (typeof AID_STATUSES)[number];
export const AID_STATUS_LABELS: Record<AidStatus, string> = {
  operating: "Operating",
  unlit: "Unlit",
  damaged: "Damaged",
  off_station: "Off station",
  missing: "Missing",
  withdrawn: "Withdrawn",
};

/** Light colour of the category; for lateral and preferred-channel marks it depends on the region. */
export function expectedLightColour(category: IalaCategory, region: IalaRegion): Colour[] | null {
  const red: Colour = "R";
  const green: Colour = "G";
  const [portColour, starboardColour] = region === "A" ? [red, green] : [green, red];
  switch (category) {
    case "port":
    case "preferred_channel_starboard": // main colour of a port mark (channel to starboard preferred)
      return [portColour];
    case "starboard":
    case "preferred_channel_port":
      return [starboardColour];
    case "north_cardinal":
    case "east_cardinal":
    case "south_cardinal":
    case "west_cardinal":
    case "isolated_danger":
    case "safe_water":
      return ["W"];
    case "special":
      return ["Y"];
    case "emergency_wreck":
      return ["Bu", "Y"];
  }
}

/** Suggested characteristics for a new aid of the category (first is the default). */
export function defaultCharacteristics(category: IalaCategory, region: IalaRegion): string[] {
  const [p, s] = region === "A" ? ["R", "G"] : ["G", "R"];
  switch (category) {
    case "port":
      return [`Fl ${p} 5s`, `Fl(2) ${p} 10s`, `Q ${p}`];
    case "starboard":
      return [`Fl ${s} 5s`, `Fl(2) ${s} 10s`, `Q ${s}`];
    case "preferred_channel_port":
      return [`Fl(2+1) ${s} 10s`];
    case "preferred_channel_starboard":
      return [`Fl(2+1) ${p} 10s`];
    case "north_cardinal":
      return ["Q", "VQ"];
    case "east_cardinal":
      return ["VQ(3) 5s", "Q(3) 10s"];
    case "south_cardinal":
      return ["Q(6)+LFl 15s", "VQ(6)+LFl 10s"];
    case "west_cardinal":
      return ["Q(9) 15s", "VQ(9) 10s"];
    case "isolated_danger":
      return ["Fl(2) 5s", "Fl(2) 10s"];
    case "safe_water":
      return ["LFl 10s", "Iso 10s", "Oc 10s", "Mo(A) 8s"];
    case "special":
      return ["Fl Y 5s"];
    case "emergency_wreck":
      return ["Al.Bu.Y 3s"];
  }
}

/**
 * A warning (not an error) when a light does not fit its category: e.g. a green light on a
 * region A port-hand buoy, or a cardinal with the wrong number of flashes.
 */
export function characteristicWarning(category: IalaCategory | null, region: IalaRegion, light: LightCharacteristic | null): string | null {
  if (!category || !light) return null;
  const expected = expectedLightColour(category, region);
  if (expected && !light.colours.every((c) => expected.includes(c))) {
    return `A ${IALA_CATEGORY_LABELS[category].toLowerCase()} mark in IALA region ${region} normally shows ${expected.join(" and ")} light; this one shows ${light.colours.join(", ")}.`;
  }
  const quick = light.rhythm === "Q" || light.rhythm === "VQ";
  const groups: Partial<Record<IalaCategory, number | null>> = { north_cardinal: null, east_cardinal: 3, south_cardinal: 6, west_cardinal: 9 };
  if (category in groups) {
    const want = groups[category];
    const got = light.group?.[0] ?? null;
    if (!quick || got !== want) {
      return `A ${IALA_CATEGORY_LABELS[category].toLowerCase()} normally shows ${defaultCharacteristics(category, region).join(" or ")}.`;
    }
  }
  return null;
}
