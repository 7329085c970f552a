import type { AlertView } from "../../../../shared/schemas/alerts.js";
import { formatClockTime, formatDateTime, formatDuration } from "../../../lib/format-time";

const DAY_MS = 24 * 3_600_000;

/** A clock time for today's moments, the day and time for older ones: "03:12", "Tue 14 Jan, 22:40". */
export function formatMoment(timeMs: number, nowMs: number): string {
  const sameDay = new Date(timeMs).toDateString() === new Date(nowMs).toDateString();
  return sameDay && nowMs - timeMs < DAY_MS ? formatClockTime(timeMs) : formatDateTime(timeMs);
}

/** How long, in words; "under a minute" rather than "none" for a fresh alert. */
export function formatSpan(durationMs: number): string {
  const words = formatDuration(durationMs);
  return words === "none" ? "under a minute" : words;
}

/**
 * Since when and for how long the bench has been (or was) out: open alerts count up to now,
 * cleared ones stop at the clearing. `sinceMs` is when the value first left the window.
 */
export function describeAlertTime(alert: AlertView, nowMs: number): { since: string; duration: string; isOver: boolean } {
  const endMs = alert.clearedAtMs ?? nowMs;
  const since = formatMoment(alert.sinceMs, nowMs);
  if (alert.clearedAtMs !== null) {
    return { since: `${since} – ${formatMoment(alert.clearedAtMs, nowMs)}`, duration: formatSpan(endMs - alert.sinceMs), isOver: true };
  }
  return { since: `Since ${since}`, duration: formatSpan(endMs - alert.sinceMs), isOver: false };
}
