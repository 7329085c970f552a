/** A shift as the rota holds it (see DutyShift in shared/schemas/alerts.ts). */
export interface RotaShift {
  zoneId: number | null;
  userId: number;
  /** Bit 0 = Sunday … bit 6 = Saturday. */
  weekdays: number;
  startMinute: number;
  endMinute: number;
  isFallback: boolean;
}

/** Weekday (0 = Sunday) and minute of the day of an instant, in an IANA time zone. */
export function localWeekdayMinute(timeMs: number, timeZone: string): { weekday: number; minute: number } {
  const parts = new Intl.DateTimeFormat("en-US", { timeZone, weekday: "short", hour: "2-digit", minute: "2-digit", hourCycle: "h23" }).formatToParts(
    new Date(timeMs),
  );
  const get = (type: string) => parts.find((p) => p.type === type)?.value ?? "";
  const weekday = ["Sun", "Mon", "Tue", "Wed", "Thu", "Fri", "Sat"].indexOf(get("weekday"));
  return { weekday, minute: Number(get("hour")) * 60 + Number(get("minute")) };
}

/**
 * True when the shift covers that local moment. A shift whose end is before its start runs past
 * midnight and belongs to the weekday it started on (a Friday 18:00–07:00 shift covers Saturday 03:00).
 */
export function shiftCovers(shift: RotaShift, weekday: number, minute: number): boolean {
  const on = (day: number) => (shift.weekdays & (1 << ((day + 7) % 7))) !== 0;
  if (shift.startMinute < shift.endMinute) return on(weekday) && minute >= shift.startMinute && minute < shift.endMinute;
  if (shift.startMinute === shift.endMinute) return on(weekday); // the whole day
  return (on(weekday) && minute >= shift.startMinute) || (on(weekday - 1) && minute < shift.endMinute);
}

/**
 * The users to tell about a zone at an instant: everyone whose shift for that zone (or for every
 * zone) covers it; when nobody's does, the fallback shifts' users. May be empty — the caller then
 * falls back to the managers.
 */
export function usersOnDuty(shifts: readonly RotaShift[], zoneId: number, timeMs: number, timeZone: string): number[] {
  const { weekday, minute } = localWeekdayMinute(timeMs, timeZone);
  const forZone = shifts.filter((s) => s.zoneId === null || s.zoneId === zoneId);
  const covering = forZone.filter((s) => !s.isFallback && shiftCovers(s, weekday, minute));
  const chosen = covering.length > 0 ? covering : forZone.filter((s) => s.isFallback && shiftCovers({ ...s, startMinute: 0, endMinute: 0 }, weekday, minute));
  return [...new Set(chosen.map((s) => s.userId))];
}

export const EVERY_DAY = 0b1111111;

/** The week in the order the rota shows it, Monday first; `bit` is the shift's weekday bit (0 = Sunday). */
export const WEEK = [
  { bit: 1, short: "Mon", long: "Monday" },
  { bit: 2, short: "Tue", long: "Tuesday" },
  { bit: 3, short: "Wed", long: "Wednesday" },
  { bit: 4, short: "Thu", long: "Thursday" },
  { bit: 5, short: "Fri", long: "Friday" },
  { bit: 6, short: "Sat", long: "Saturday" },
  { bit: 0, short: "Sun", long: "Sunday" },
] as const;

export function hasDay(weekdays: number, bit: number): boolean {
  return (weekdays & (1 << bit)) !== 0;
}

/** A shift's days (bit 0 = Sunday) in plain words, Monday first: "Every day", "Mon–Fri", "Sat, Sun", "Tue–Thu, Sun". */
export function describeWeekdays(weekdays: number): string {
  if ((weekdays & EVERY_DAY) === EVERY_DAY) return "Every day";
  if ((weekdays & EVERY_DAY) === 0) return "No days";
  const runs: (typeof WEEK)[number][][] = [];
  for (const day of WEEK) {
    if (!hasDay(weekdays, day.bit)) continue;
    const last = runs.at(-1);
    const previous = last?.at(-1);
    if (last && previous && WEEK.indexOf(previous) === WEEK.indexOf(day) - 1) last.push(day);
    else runs.push([day]);
  }
  return runs.map((run) => (run.length >= 3 ? `${run[0]!.short}–${run.at(-1)!.short}` : run.map((d) => d.short).join(", "))).join(", ");
}

/**
 * A minute of the day (0–1440, local to the site) on a 24-hour clock: 1110 → "18:30". The end of
 * the day, 1440, is "24:00", so an all-day shift reads 00:00 to 24:00. For records that must read
 * the same for everyone (the audit trail); the rota page shows times in the reader's locale.
 */
export function clockTime(minute: number): string {
  return `${String(Math.floor(minute / 60)).padStart(2, "0")}:${String(minute % 60).padStart(2, "0")}`;
}
