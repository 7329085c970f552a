import { parseDurationMs } from "../shared/domain/duration.js";

/** Parse "500ms", "5s", "10m", "2h", "1d" or a bare number of seconds into milliseconds. */
export function parseDuration(text: string): number {
  const ms = parseDurationMs(text);
  if (ms === undefined) throw new Error(`"${text}" is not a duration (e.g. 500ms, 5s, 10m, 2h)`);
  return ms;
}

/** Milliseconds as h:mm:ss (or m:ss under an hour). */
export function formatDuration(ms: number): string {
  const total = Math.max(0, Math.round(ms / 1000));
  const h = Math.floor(total / 3600);
  const m = Math.floor((total % 3600) / 60);
  const s = total % 60;
  const mmss = `${String(m).padStart(h > 0 ? 2 : 1, "0")}:${String(s).padStart(2, "0")}`;
  return h > 0 ? `${h}:${mmss}` : mmss;
}

/** "HH:MM" (or "H", "H.5") → fractional hour of day. */
export function parseClock(text: string): number {
  const m = /^\s*(\d{1,2})(?::(\d{2}))?\s*$/.exec(text);
  if (!m) throw new Error(`"${text}" is not a time of day (HH:MM)`);
  const h = Number(m[1]);
  const min = Number(m[2] ?? 0);
  if (h > 23 || min > 59) throw new Error(`"${text}" is not a time of day (HH:MM)`);
  return h + min / 60;
}

export function formatClock(hour: number): string {
  const totalMin = Math.round((((hour % 24) + 24) % 24) * 60) % (24 * 60);
  return `${String(Math.floor(totalMin / 60)).padStart(2, "0")}:${String(totalMin % 60).padStart(2, "0")}`;
}
