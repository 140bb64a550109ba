// Local wall-clock time in the harbour's zone ↔ instants, with Intl only (browser and server).

function offsetMs(instantMs: number, zone: string): number {
  const parts = new Intl.DateTimeFormat("en-GB", {
    timeZone: zone,
    hourCycle: "h23",
    year: "numeric",
    month: "2-digit",
    day: "2-digit",
    hour: "2-digit",
    minute: "2-digit",
    second: "2-digit",
  }).formatToParts(new Date(instantMs));
  const get = (t: string) => Number(parts.find((p) => p.type === t)?.value);
  const asUtc = Date.UTC(get("year"), get("month") - 1, get("day"), get("hour"), get("minute"), get("second"));
  return asUtc - Math.floor(instantMs / 1000) * 1000;
}

/** "2026-11-30T14:05" in `zone` → ISO instant ("2026-11-30T14:05:00.000Z"), or null if malformed. */
export function zonedLocalToIso(local: string, zone: string): string | null {
  const m = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2})(?::(\d{2}))?$/.exec(local.trim());
  if (!m) return null;
  const [y, mo, d, h, mi, s] = [m[1], m[2], m[3], m[4], m[5], m[6] ?? "0"].map(Number) as number[];
  if (mo! < 1 || mo! > 12 || d! < 1 || d! > 31 || h! > 23 || mi! > 59 || s! > 59) return null;
  const guess = Date.UTC(y!, mo! - 1, d!, h!, mi!, s!);
  let t = guess - offsetMs(guess, zone);
  t = guess - offsetMs(t, zone); // second pass settles daylight-saving edges
  const back = new Date(t);
  return Number.isNaN(back.getTime()) ? null : back.toISOString();
}

/** An instant → "YYYY-MM-DDTHH:mm" wall-clock time in `zone` (for datetime-local inputs). */
export function isoToZonedLocal(iso: string | Date, zone: string): string {
  const ms = typeof iso === "string" ? Date.parse(iso) : iso.getTime();
  const local = new Date(ms + offsetMs(ms, zone));
  return local.toISOString().slice(0, 16);
}

/** "30 Nov 2026, 14:05 (Europe/London)" */
export function formatInZone(iso: string | Date, zone: string): string {
  const d = typeof iso === "string" ? new Date(iso) : iso;
  return `${new Intl.DateTimeFormat("en-GB", { timeZone: zone, day: "numeric", month: "short", year: "numeric", hour: "2-digit", minute: "2-digit", hourCycle: "h23" }).format(d)} (${zone})`;
}
