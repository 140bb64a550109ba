/**
 * Notice vocabulary from IHO S-124 (Navigational Warnings product specification, feature
 * catalogue 1.5, 2024), as summarised in ../shared/TRADE.md. Detail-type and restriction codes
 * are the S-124 numeric codes; general types are named (S-124 navwarnTypeGeneral values).
 */

export const GENERAL_TYPES = [
  { key: "aids_to_navigation_changes", label: "Aids to navigation changes" },
  { key: "newly_discovered_dangers", label: "Newly discovered dangers" },
  { key: "works", label: "Works" },
  { key: "drifting_hazards", label: "Drifting hazards" },
  { key: "special_operations", label: "Special operations" },
  { key: "routeing_change", label: "Routeing change" },
  { key: "other_hazards", label: "Other hazards" },
  { key: "aquaculture_and_fishing_installations", label: "Aquaculture and fishing installations" },
  { key: "towing_operations", label: "Towing operations" },
  { key: "offshore_infrastructure", label: "Offshore infrastructure" },
  { key: "dangerous_natural_phenomena", label: "Dangerous natural phenomena" },
  { key: "scientific_instruments_change", label: "Scientific instruments change" },
  { key: "communication_or_broadcast_service_change", label: "Communication or broadcast service change" },
  { key: "security_requirement_change", label: "Security requirement change" },
  { key: "health_advisories", label: "Health advisories" },
  { key: "ice_information", label: "Ice information" },
  { key: "piracy_or_robbery", label: "Piracy or robbery" },
] as const;

export type GeneralType = (typeof GENERAL_TYPES)[number]["key"];
export const GENERAL_TYPE_KEYS = GENERAL_TYPES.map((g) => g.key) as [GeneralType, ...GeneralType[]];

/** S-124 navwarnTypeDetails: the values Tidewire offers (code → label, and the usual general type). */
export const DETAIL_TYPES = [
  { code: 51, label: "Buoy off position", general: "aids_to_navigation_changes" },
  { code: 41, label: "Buoy adrift", general: "aids_to_navigation_changes" },
  { code: 49, label: "Buoy missing", general: "aids_to_navigation_changes" },
  { code: 44, label: "Buoy damaged", general: "aids_to_navigation_changes" },
  { code: 153, label: "Light buoy – light unlit", general: "aids_to_navigation_changes" },
  { code: 170, label: "Light unlit", general: "aids_to_navigation_changes" },
  { code: 273, label: "Temporary buoyage", general: "aids_to_navigation_changes" },
  { code: 73, label: "Dangerous wreck", general: "newly_discovered_dangers" },
  { code: 270, label: "Submerged object", general: "newly_discovered_dangers" },
  { code: 277, label: "Uncharted rock", general: "newly_discovered_dangers" },
  { code: 256, label: "Shallow depth reported", general: "newly_discovered_dangers" },
  { code: 89, label: "Dredging operation", general: "works" },
  { code: 64, label: "Cable laying operation", general: "works" },
  { code: 298, label: "Works in progress", general: "works" },
  { code: 87, label: "Diving operation", general: "special_operations" },
  { code: 146, label: "Hydrographic survey activity", general: "special_operations" },
  { code: 235, label: "Regatta or race", general: "special_operations" },
  { code: 119, label: "Fireworks", general: "special_operations" },
  { code: 111, label: "Exclusion zone", general: "routeing_change" },
  { code: 201, label: "Opening or closing of waters", general: "routeing_change" },
  { code: 292, label: "Vessel disabled", general: "other_hazards" },
] as const satisfies ReadonlyArray<{ code: number; label: string; general: GeneralType }>;

/** S-124 restrictions (code → label). */
export const RESTRICTIONS = [
  { code: 1, label: "Anchoring prohibited" },
  { code: 3, label: "Fishing prohibited" },
  { code: 7, label: "Entry prohibited" },
  { code: 8, label: "Entry restricted" },
  { code: 11, label: "Diving prohibited" },
  { code: 13, label: "No wake" },
  { code: 14, label: "Area to be avoided" },
  { code: 27, label: "Speed restricted" },
  { code: 28, label: "Overtaking prohibited" },
  { code: 39, label: "Swimming prohibited" },
] as const;

export const DETAIL_CODES: ReadonlySet<number> = new Set(DETAIL_TYPES.map((d) => d.code));
export const RESTRICTION_CODES: ReadonlySet<number> = new Set(RESTRICTIONS.map((r) => r.code));

export function generalTypeLabel(key: string): string {
  return GENERAL_TYPES.find((g) => g.key === key)?.label ?? key;
}
export function detailTypeLabel(code: number): string {
  return DETAIL_TYPES.find((d) => d.code === code)?.label ?? `Detail type ${code}`;
}
export function restrictionLabel(code: number): string {
  return RESTRICTIONS.find((r) => r.code === code)?.label ?? `Restriction ${code}`;
}

export const NOTICE_STATUSES = ["draft", "in_force", "expired", "cancelled", "superseded"] as const;
export type NoticeStatus = (typeof NOTICE_STATUSES)[number];
export const STATUS_LABELS: Record<NoticeStatus, string> = {
  draft: "Draft",
  in_force: "In force",
  expired: "Expired",
  cancelled: "Cancelled",
  superseded: "Superseded",
};

export const PART_KINDS = ["point", "line", "area", "circle"] as const;
export type PartKind = (typeof PART_KINDS)[number];
export const PART_KIND_LABELS: Record<PartKind, string> = {
  point: "Point",
  line: "Line",
  area: "Area (polygon)",
  circle: "Circle (centre and radius)",
};

/**
 * "KSH 2026/014": series code, year, number with at least three digits (common practice for
 * local warning series; the MSI manual asks for series identifier and number/year).
 */
export function formatSeriesNumber(seriesCode: string, year: number, number: number): string {
  return `${seriesCode} ${year}/${String(number).padStart(3, "0")}`;
}
