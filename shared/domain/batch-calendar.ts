/**
 * Local calendar arithmetic for batches and walk-throughs: a batch is stuck on a calendar date of
 * the nursery, and the morning round looks back to 18:00 of the day before, both in the site's
 * IANA time zone. Pure (Intl only); "now" is always passed in.
 */
import { calendarDayNumber } from "./batch.js";

/** The evening hour the morning walk-through looks back to when a bench has no earlier round (issue 6 §3). */
export const ROUND_LOOKBACK_MINUTE = 18 * 60;

const formatters = new Map<string, Intl.DateTimeFormat>();

function formatter(timeZone: string): Intl.DateTimeFormat {
  let f = formatters.get(timeZone);
  if (!f) {
    f = new Intl.DateTimeFormat("en-US", {
      timeZone,
      year: "numeric",
      month: "2-digit",
      day: "2-digit",
      hour: "2-digit",
      minute: "2-digit",
      second: "2-digit",
      hourCycle: "h23",
    });
    formatters.set(timeZone, f);
  }
  return f;
}

interface LocalParts {
  year: number;
  month: number;
  day: number;
  hour: number;
  minute: number;
  second: number;
}

function localParts(timeMs: number, timeZone: string): LocalParts {
  const parts = formatter(timeZone).formatToParts(new Date(timeMs));
  const get = (type: string) => Number(parts.find((p) => p.type === type)?.value ?? "0");
  return { year: get("year"), month: get("month"), day: get("day"), hour: get("hour") % 24, minute: get("minute"), second: get("second") };
}

/** Offset of the time zone from UTC at an instant, ms (e.g. −5 h for America/Chicago in summer). */
function offsetMs(timeMs: number, timeZone: string): number {
  const p = localParts(timeMs, timeZone);
  const asUtc = Date.UTC(p.year, p.month - 1, p.day, p.hour, p.minute, p.second);
  return asUtc - (timeMs - (timeMs % 1000 + 1000) % 1000);
}

const pad = (n: number, width = 2) => String(n).padStart(width, "0");

/** The local calendar date "YYYY-MM-DD" of an instant in an IANA time zone. */
export function localDate(timeMs: number, timeZone: string): string {
  const p = localParts(timeMs, timeZone);
  return `${pad(p.year, 4)}-${pad(p.month)}-${pad(p.day)}`;
}

/** The date `days` calendar days after `date` ("YYYY-MM-DD"; negative goes back); undefined for no real date. */
export function addDays(date: string, days: number): string | undefined {
  const n = calendarDayNumber(date);
  if (n === undefined) return undefined;
  return new Date((n + days) * 86_400_000).toISOString().slice(0, 10);
}

/**
 * The instant of a local wall-clock time (minutes after midnight) on a local date, ms since 1970.
 * A time skipped by a daylight-saving change (02:30 on a spring-forward night) moves forward by
 * the length of the gap (→ 03:30), and a time that occurs twice (autumn) resolves to the first —
 * the "compatible" rule of ECMAScript Temporal and of RFC 5545 §3.3.5.
 * undefined when `date` is no real date.
 */
export function localTimeToMs(date: string, minuteOfDay: number, timeZone: string): number | undefined {
  const n = calendarDayNumber(date);
  if (n === undefined) return undefined;
  const wallMs = n * 86_400_000 + minuteOfDay * 60_000;
  // Two passes settle the offset except inside a gap; the earlier candidate wins an overlap.
  const first = wallMs - offsetMs(wallMs, timeZone);
  const second = wallMs - offsetMs(first, timeZone);
  const candidates = [first, second].filter((ms) => {
    const p = localParts(ms, timeZone);
    return Date.UTC(p.year, p.month - 1, p.day, p.hour, p.minute) === wallMs;
  });
  if (candidates.length > 0) return Math.min(...candidates);
  // In a spring-forward gap the wall time does not exist: the earlier offset carries it past the gap.
  return Math.max(first, second);
}

/** Local midnight at the start of `date`, ms since 1970 (undefined for no real date). */
export function localMidnightMs(date: string, timeZone: string): number | undefined {
  return localTimeToMs(date, 0, timeZone);
}

/**
 * Where a walk-through card looks back to when the bench was not checked in an earlier finished
 * round: 18:00 local on the day before `atMs` (issue 6 §3: "since 18:00 the day before").
 */
export function roundLookbackStartMs(atMs: number, timeZone: string): number {
  const yesterday = addDays(localDate(atMs, timeZone), -1) as string;
  return localTimeToMs(yesterday, ROUND_LOOKBACK_MINUTE, timeZone) as number;
}

/** Where on the day a date-only observation is placed: local noon, the middle of the day it names. */
export const DATE_ONLY_OBSERVATION_MINUTE = 12 * 60;

/**
 * When an observation was made, for placing it in time (a chart marker, the bench its batch stood
 * on). An observation names a date (site time) and was recorded at an instant: when the instant
 * falls on that date, it is the time; otherwise the observation was entered on a later day (or its
 * date corrected), only the day is known, and it is placed at local noon of its date
 * (`isDateOnly`). An impossible date also falls back to the recording instant.
 */
export function observationTime(observedOn: string, recordedAtMs: number, timeZone: string): { timeMs: number; isDateOnly: boolean } {
  if (localDate(recordedAtMs, timeZone) === observedOn) return { timeMs: recordedAtMs, isDateOnly: false };
  const noonMs = localTimeToMs(observedOn, DATE_ONLY_OBSERVATION_MINUTE, timeZone);
  return noonMs === undefined ? { timeMs: recordedAtMs, isDateOnly: false } : { timeMs: noonMs, isDateOnly: true };
}
