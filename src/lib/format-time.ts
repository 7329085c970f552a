const MINUTE_MS = 60_000;
const HOUR_MS = 60 * MINUTE_MS;
const DAY_MS = 24 * HOUR_MS;

/** A reading older than this is called out on the card: its probe may have gone quiet. */
export const STALE_AFTER_MS = 10 * MINUTE_MS;

/** How long ago `timeMs` was, relative to `nowMs`, in short words: "just now", "4 min ago", "2 h 5 min ago". */
export function formatAge(timeMs: number, nowMs: number): string {
  const ageMs = Math.max(0, nowMs - timeMs);
  if (ageMs < MINUTE_MS) return "just now";
  if (ageMs < HOUR_MS) return `${Math.floor(ageMs / MINUTE_MS)} min ago`;
  if (ageMs < DAY_MS) {
    const hours = Math.floor(ageMs / HOUR_MS);
    const minutes = Math.floor((ageMs % HOUR_MS) / MINUTE_MS);
    return minutes > 0 ? `${hours} h ${minutes} min ago` : `${hours} h ago`;
  }
  const days = Math.floor(ageMs / DAY_MS);
  return days === 1 ? "1 day ago" : `${days} days ago`;
}

export function isStale(timeMs: number, nowMs: number): boolean {
  return nowMs - timeMs > STALE_AFTER_MS;
}

/** Clock time for chart axes and tooltips, in the browser's locale and time zone. */
export function formatClockTime(timeMs: number): string {
  return new Date(timeMs).toLocaleTimeString(undefined, { hour: "numeric", minute: "2-digit" });
}

/** Full date and time, for titles and tooltips. */
export function formatDateTime(timeMs: number): string {
  return new Date(timeMs).toLocaleString(undefined, {
    weekday: "short",
    hour: "numeric",
    minute: "2-digit",
    day: "numeric",
    month: "short",
  });
}

/** A duration in short words: "45 min", "2 h 10 min", "none". */
export function formatDuration(durationMs: number): string {
  const totalMinutes = Math.round(durationMs / MINUTE_MS);
  if (totalMinutes <= 0) return "none";
  const hours = Math.floor(totalMinutes / 60);
  const minutes = totalMinutes % 60;
  if (hours === 0) return `${minutes} min`;
  return minutes === 0 ? `${hours} h` : `${hours} h ${minutes} min`;
}
