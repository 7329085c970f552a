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
