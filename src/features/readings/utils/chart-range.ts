/**
 * The time range a history chart shows. The three presets always end "now" (the moment the data
 * is fetched, so a refetch moves the chart forward); a custom range is a span of whole local days,
 * from the first day's midnight to the end of the last day (or now, if that is sooner).
 */
export type PresetRange = "24h" | "7d" | "30d";
export type ChartRange = { kind: PresetRange } | { kind: "custom"; from: string; to: string };

const HOUR_MS = 3_600_000;
const DAY_MS = 24 * HOUR_MS;

export const PRESET_RANGE_MS: Record<PresetRange, number> = { "24h": DAY_MS, "7d": 7 * DAY_MS, "30d": 30 * DAY_MS };

export const RANGE_CHOICES = [
  { value: "24h", label: "24 h", description: "The last 24 hours" },
  { value: "7d", label: "7 d", description: "The last 7 days" },
  { value: "30d", label: "30 d", description: "The last 30 days" },
  { value: "custom", label: "Dates", description: "Choose the first and last day" },
] as const;

/** The longest custom range the readings API answers (server/modules/readings: 400 days). */
export const MAX_CUSTOM_RANGE_DAYS = 400;

export const DEFAULT_RANGE: ChartRange = { kind: "24h" };

const DATE_RE = /^\d{4}-\d{2}-\d{2}$/;

/** "2025-01-15" → local midnight of that day, or NaN. */
export function localDayStartMs(date: string): number {
  if (!DATE_RE.test(date)) return Number.NaN;
  const [y, m, d] = date.split("-").map(Number) as [number, number, number];
  const day = new Date(y, m - 1, d);
  // Reject 2025-02-31 and the like, which Date would roll over.
  if (day.getFullYear() !== y || day.getMonth() !== m - 1 || day.getDate() !== d) return Number.NaN;
  return day.getTime();
}

/** Local midnight after the given day (DST-safe: calendar arithmetic, not + 24 h). */
function nextLocalDayStartMs(date: string): number {
  const start = localDayStartMs(date);
  if (Number.isNaN(start)) return start;
  const day = new Date(start);
  return new Date(day.getFullYear(), day.getMonth(), day.getDate() + 1).getTime();
}

/** A time as the value of an `<input type="date">` in local time: "2025-01-15". */
export function toDateInputValue(timeMs: number): string {
  const d = new Date(timeMs);
  const pad = (n: number) => String(n).padStart(2, "0");
  return `${d.getFullYear()}-${pad(d.getMonth() + 1)}-${pad(d.getDate())}`;
}

/** Why a custom range cannot be shown, or null when it can. */
export function customRangeProblem(from: string, to: string): { field: "from" | "to"; message: string } | null {
  const fromMs = localDayStartMs(from);
  const toMs = localDayStartMs(to);
  if (Number.isNaN(fromMs)) return { field: "from", message: "Choose the first day" };
  if (Number.isNaN(toMs)) return { field: "to", message: "Choose the last day" };
  if (toMs < fromMs) return { field: "to", message: "The last day cannot be before the first" };
  if (nextLocalDayStartMs(to) - fromMs > MAX_CUSTOM_RANGE_DAYS * DAY_MS + HOUR_MS) {
    return { field: "to", message: `Show at most ${MAX_CUSTOM_RANGE_DAYS} days at a time` };
  }
  return null;
}

/** The range's bounds in ms. Presets end at `nowMs`; a custom range ends at the end of its last day, or now if sooner. */
export function rangeBounds(range: ChartRange, nowMs: number): { fromMs: number; toMs: number } {
  if (range.kind === "custom") {
    const fromMs = localDayStartMs(range.from);
    const endMs = nextLocalDayStartMs(range.to);
    return { fromMs, toMs: Math.max(fromMs + 60_000, Math.min(endMs, nowMs)) };
  }
  return { fromMs: nowMs - PRESET_RANGE_MS[range.kind], toMs: nowMs };
}

/** The range from a page's address: `?range=7d`, `?range=30d`, `?from=2025-01-01&to=2025-01-07`; anything else is 24 h. */
export function rangeFromSearch(search: URLSearchParams): ChartRange {
  const from = search.get("from");
  const to = search.get("to");
  if (from && to && customRangeProblem(from, to) === null) return { kind: "custom", from, to };
  const preset = search.get("range");
  if (preset === "7d" || preset === "30d") return { kind: preset };
  return DEFAULT_RANGE;
}

/** The search part of an address for a range (empty for the default 24 h). */
export function rangeToSearch(range: ChartRange): string {
  if (range.kind === "custom") return `?${new URLSearchParams({ from: range.from, to: range.to })}`;
  if (range.kind === "24h") return "";
  return `?range=${range.kind}`;
}

function formatDay(date: string): string {
  return new Date(localDayStartMs(date)).toLocaleDateString(undefined, { day: "numeric", month: "short", year: "numeric" });
}

/** Words for the range, for headings: "Last 24 hours", "Last 7 days", "3 Jan 2025 – 9 Jan 2025". */
export function describeRange(range: ChartRange): string {
  switch (range.kind) {
    case "24h":
      return "Last 24 hours";
    case "7d":
      return "Last 7 days";
    case "30d":
      return "Last 30 days";
    case "custom":
      return range.from === range.to ? formatDay(range.from) : `${formatDay(range.from)} – ${formatDay(range.to)}`;
  }
}

/** "in the last 24 hours" / "in this range", for the empty-chart message. */
export function describeRangeInSentence(range: ChartRange): string {
  return range.kind === "custom" ? "in this range" : `in the ${describeRange(range).toLowerCase()}`;
}
