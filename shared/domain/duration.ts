/**
 * Parses a duration as people write it in settings: "500ms", "5s", "10m", "2h", "1d", or a bare
 * number of seconds. Returns milliseconds, or undefined for anything else (negative included).
 */
export function parseDurationMs(text: string): number | undefined {
  const m = /^\s*(\d+(?:\.\d+)?)\s*(ms|s|m|h|d)?\s*$/i.exec(text);
  if (!m) return undefined;
  const factor = { ms: 1, s: 1000, m: 60_000, h: 3_600_000, d: 86_400_000 }[(m[2] ?? "s").toLowerCase() as "ms"];
  return Math.round(Number(m[1]) * factor);
}

/**
 * Seconds in words for settings and records: "45 seconds", "20 minutes", "1 hour", "1 hour 30 minutes",
 * "12 hours". Rounded to whole minutes from a minute up.
 */
export function describeDurationS(seconds: number): string {
  const plural = (n: number, word: string) => `${n} ${word}${n === 1 ? "" : "s"}`;
  if (seconds < 60) return plural(Math.round(seconds), "second");
  const minutes = Math.round(seconds / 60);
  const hours = Math.floor(minutes / 60);
  const rest = minutes % 60;
  if (hours === 0) return plural(minutes, "minute");
  return rest === 0 ? plural(hours, "hour") : `${plural(hours, "hour")} ${plural(rest, "minute")}`;
}
