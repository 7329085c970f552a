import { EVERY_DAY } from "../../../../shared/domain/duty-rota.js";
import type { DutyShift } from "../../../../shared/schemas/alerts.js";

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

export const WEEKDAYS_MASK = 0b0111110;
export const WEEKEND_MASK = 0b1000001;
export const DAY_MINUTES = 24 * 60;

export function hasDay(weekdays: number, bit: number): boolean {
  return (weekdays & (1 << bit)) !== 0;
}

/** "Every day", "Mon–Fri", "Sat, Sun", "Mon, Wed, Fri", "Tue–Thu, Sun". */
export function describeWeekdays(weekdays: number): string {
  if ((weekdays & EVERY_DAY) === EVERY_DAY) return "Every day";
  if (weekdays === 0) return "No days";
  const runs: (typeof WEEK)[number][][] = [];
  for (const day of WEEK) {
    if (!hasDay(weekdays, day.bit)) continue;
    const last = runs.at(-1);
    const previous = last?.at(-1);
    if (last && previous && WEEK.indexOf(previous) === WEEK.indexOf(day) - 1) last.push(day);
    else runs.push([day]);
  }
  return runs
    .map((run) => (run.length >= 3 ? `${run[0]!.short}–${run.at(-1)!.short}` : run.map((d) => d.short).join(", ")))
    .join(", ");
}

/** A minute of the day as a clock time in the reader's locale ("6:00 PM" or "18:00"); 1440 is midnight. */
export function formatMinuteOfDay(minute: number): string {
  if (minute === 0 || minute === DAY_MINUTES) return "midnight";
  return new Date(Date.UTC(2000, 0, 1, 0, minute)).toLocaleTimeString(undefined, { hour: "numeric", minute: "2-digit", timeZone: "UTC" });
}

export function isAllDay(shift: Pick<DutyShift, "startMinute" | "endMinute">): boolean {
  return shift.startMinute === shift.endMinute || (shift.startMinute === 0 && shift.endMinute === DAY_MINUTES);
}

/** "All day", "8:00 AM – 5:00 PM", "6:00 PM – 7:00 AM next day". */
export function describeHours(shift: Pick<DutyShift, "startMinute" | "endMinute">): string {
  if (isAllDay(shift)) return "All day";
  const range = `${formatMinuteOfDay(shift.startMinute)} – ${formatMinuteOfDay(shift.endMinute)}`;
  return shift.endMinute < shift.startMinute && shift.endMinute !== 0 ? `${range} next day` : range;
}

/** "18:30" (an `<input type="time">` value) → 1110, or undefined when empty or malformed. */
export function minuteFromTimeInput(value: string): number | undefined {
  const match = /^(\d{2}):(\d{2})$/.exec(value);
  if (!match) return undefined;
  const hours = Number(match[1]);
  const minutes = Number(match[2]);
  if (hours > 23 || minutes > 59) return undefined;
  return hours * 60 + minutes;
}

/** 1110 → "18:30"; the end of the day (1440) shows as "00:00", which means the same midnight. */
export function timeInputFromMinute(minute: number): string {
  const m = minute % DAY_MINUTES;
  return `${String(Math.floor(m / 60)).padStart(2, "0")}:${String(m % 60).padStart(2, "0")}`;
}
