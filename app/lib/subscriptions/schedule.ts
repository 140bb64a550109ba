// Digest scheduling in the harbour's local time (luxon), and the period keys that make each
// digest unique: one per (subscription, local day) or (subscription, ISO week).
import { DateTime } from "luxon";

export type DigestCadence = "none" | "daily" | "weekly";
export type DigestSchedule = { cadence: DigestCadence; localTime: string | null; weekday: number | null };

export const WEEKDAYS = ["Monday", "Tuesday", "Wednesday", "Thursday", "Friday", "Saturday", "Sunday"] as const;

export class ScheduleError extends Error {
  constructor(
    message: string,
    readonly field: "digestLocalTime" | "digestWeekday" | "digestCadence",
  ) {
    super(message);
  }
}

export function parseLocalTime(text: string): { hour: number; minute: number } {
  const m = /^([01]\d|2[0-3]):([0-5]\d)$/.exec(text.trim());
  if (!m) throw new ScheduleError("Enter the time as HH:MM on the 24-hour clock, e.g. 07:30.", "digestLocalTime");
  return { hour: Number(m[1]), minute: Number(m[2]) };
}

/**
 * A local time that falls in a daylight-saving gap does not exist on the day clocks go forward
 * (01:00–02:00 in Europe/London on the last Sunday of March). Such a time is refused with the
 * date and the gap named, rather than silently moved: the subscriber picks a real time.
 * Looks ahead `days` days (a year covers every transition of a zone).
 */
export function checkLocalTimeExists(timeZone: string, localTime: string, from: Date = new Date(), days = 370): void {
  const { hour, minute } = parseLocalTime(localTime);
  const start = DateTime.fromJSDate(from, { zone: timeZone });
  if (!start.isValid) throw new ScheduleError(`Unknown time zone ${timeZone}.`, "digestLocalTime");
  for (let i = 0; i < days; i++) {
    const day = start.plus({ days: i });
    const dt = DateTime.fromObject({ year: day.year, month: day.month, day: day.day, hour, minute }, { zone: timeZone });
    if (dt.hour !== hour || dt.minute !== minute) {
      const gap = gapOn(day, timeZone);
      throw new ScheduleError(
        `${localTime} does not exist in ${timeZone} on ${day.toFormat("cccc d LLLL yyyy")}: clocks go forward from ${gap.start} to ${gap.end}. Choose a time outside that gap.`,
        "digestLocalTime",
      );
    }
  }
}

/** The wall-clock gap of a spring-forward day, found in 15-minute steps (zones shift by 30 or 60 min). */
function gapOn(day: DateTime, timeZone: string): { start: string; end: string } {
  const midnight = DateTime.fromObject({ year: day.year, month: day.month, day: day.day }, { zone: timeZone });
  const endOfDay = midnight.plus({ hours: 26 });
  const gapMinutes = endOfDay.offset - midnight.offset;
  for (let m = 0; m < 24 * 60; m += 15) {
    const hour = Math.floor(m / 60);
    const minute = m % 60;
    const dt = DateTime.fromObject({ year: day.year, month: day.month, day: day.day, hour, minute }, { zone: timeZone });
    if (dt.hour !== hour || dt.minute !== minute) {
      const fmt = (total: number) => `${String(Math.floor(total / 60) % 24).padStart(2, "0")}:${String(total % 60).padStart(2, "0")}`;
      return { start: fmt(m), end: fmt(m + gapMinutes) };
    }
  }
  return { start: "?", end: "?" };
}

/** Validates a schedule; throws ScheduleError naming the field. */
export function validateSchedule(s: DigestSchedule, timeZone: string, now: Date = new Date()): void {
  if (s.cadence === "none") return;
  if (!s.localTime) throw new ScheduleError("Choose the time of day for your digest.", "digestLocalTime");
  checkLocalTimeExists(timeZone, s.localTime, now);
  if (s.cadence === "weekly" && !(Number.isInteger(s.weekday) && s.weekday! >= 1 && s.weekday! <= 7)) {
    throw new ScheduleError("Choose the day of the week for your weekly digest.", "digestWeekday");
  }
}

/** The first digest slot strictly after `after` (UTC instant), or null for cadence "none". */
export function nextDigestAt(s: DigestSchedule, timeZone: string, after: Date): Date | null {
  if (s.cadence === "none" || !s.localTime) return null;
  const { hour, minute } = parseLocalTime(s.localTime);
  const base = DateTime.fromJSDate(after, { zone: timeZone });
  for (let i = 0; i <= 8; i++) {
    const day = base.plus({ days: i });
    if (s.cadence === "weekly" && day.weekday !== s.weekday) continue;
    const slot = DateTime.fromObject({ year: day.year, month: day.month, day: day.day, hour, minute }, { zone: timeZone });
    if (slot.toMillis() > after.getTime()) return slot.toJSDate();
  }
  throw new Error("no digest slot within 8 days"); // unreachable for a valid schedule
}

/** The period a slot belongs to: `D2026-12-01` (local date) or `W2026-W49` (ISO week). */
export function digestPeriodKey(cadence: Exclude<DigestCadence, "none">, timeZone: string, slot: Date): string {
  const local = DateTime.fromJSDate(slot, { zone: timeZone });
  return cadence === "daily" ? `D${local.toISODate()}` : `W${local.toFormat("kkkk-'W'WW")}`;
}

export function describeSchedule(s: DigestSchedule, timeZone: string): string {
  if (s.cadence === "none") return "no digest";
  if (s.cadence === "daily") return `daily at ${s.localTime} (${timeZone})`;
  return `weekly on ${WEEKDAYS[(s.weekday ?? 1) - 1]} at ${s.localTime} (${timeZone})`;
}
