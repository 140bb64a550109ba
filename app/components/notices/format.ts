/** Display helpers for notices (pure; used on the server and in the browser alike). */
// Building an Intl.DateTimeFormat is costly (it was the hottest function of the board's server
// render); one per time zone is enough.
const localFormats = new Map<string, Intl.DateTimeFormat>();

export function formatLocal(iso: string | null | undefined, zone: string): string {
  if (!iso) return "";
  let f = localFormats.get(zone);
  if (!f) {
    f = new Intl.DateTimeFormat("en-GB", { timeZone: zone, day: "numeric", month: "short", year: "numeric", hour: "2-digit", minute: "2-digit", hourCycle: "h23" });
    localFormats.set(zone, f);
  }
  return f.format(new Date(iso));
}

export function formatUtc(iso: string | null | undefined): string {
  if (!iso) return "";
  const d = new Date(iso);
  const p = (n: number) => String(n).padStart(2, "0");
  return `${d.getUTCFullYear()}-${p(d.getUTCMonth() + 1)}-${p(d.getUTCDate())} ${p(d.getUTCHours())}:${p(d.getUTCMinutes())} UTC`;
}
