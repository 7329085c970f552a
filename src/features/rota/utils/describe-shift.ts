import type { DutyShift } from "../../../../shared/schemas/alerts.js";

// The week and its words are shared: the audit trail names a shift's days the same way.
export { WEEK, describeWeekdays, hasDay } from "../../../../shared/domain/duty-rota.js";

export const WEEKDAYS_MASK = 0b0111110;
export const WEEKEND_MASK = 0b1000001;
export const DAY_MINUTES = 24 * 60;

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
