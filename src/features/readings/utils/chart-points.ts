import { dewPointC, vapourPressureDeficitKPa } from "../../../../shared/domain/psychrometrics.js";
import { displayDecimals, toDisplayValue, type TemperatureUnit } from "../../../../shared/domain/units.js";
import { classifyValue } from "../../../../shared/domain/window-status.js";
import type { Quantity } from "../../../../shared/schemas/quantities.js";
import { formatClockTime } from "../../../lib/format-time";
import type { SeriesPoint } from "../../../../shared/schemas/readings.js";
import type { QuantityWindow, WindowStatus } from "../../../../shared/schemas/windows.js";

/** One plotted bucket, in display units; `null` values break the line where readings are missing. */
export type ChartPoint = {
  timeMs: number;
  mean: number | null;
  range: [number, number] | null;
  /** The stored (SI) values, for the tooltip's formatting. */
  si: Pick<SeriesPoint, "min" | "mean" | "max" | "count"> | null;
  /** Where the bucket's mean stands against the window. */
  status: WindowStatus;
};

/** A gap longer than this many buckets is drawn as a gap, not bridged by a straight line. */
const GAP_BUCKETS = 2.5;

/** Buckets → chart points in the user's unit, with a break inserted at every gap in the data. */
export function toChartPoints(
  points: readonly SeriesPoint[],
  quantity: Quantity,
  unit: TemperatureUnit,
  bucketMs: number,
  window: QuantityWindow | undefined,
): ChartPoint[] {
  const sorted = [...points].sort((a, b) => a.timeMs - b.timeMs);
  const result: ChartPoint[] = [];
  let previous: SeriesPoint | undefined;
  for (const point of sorted) {
    if (previous && bucketMs > 0 && point.timeMs - previous.timeMs > GAP_BUCKETS * bucketMs) {
      result.push({ timeMs: previous.timeMs + bucketMs, mean: null, range: null, si: null, status: "unknown" });
    }
    result.push({
      timeMs: point.timeMs,
      mean: toDisplayValue(quantity, point.mean, unit),
      range: [toDisplayValue(quantity, point.min, unit), toDisplayValue(quantity, point.max, unit)],
      si: { min: point.min, mean: point.mean, max: point.max, count: point.count },
      status: classifyValue(point.mean, window),
    });
    previous = point;
  }
  return result;
}

/** A round tick step (1, 2, 2.5 or 5 × 10ⁿ) that cuts `span` into about `targetCount` parts. */
function niceStep(span: number, targetCount: number): number {
  const raw = span / targetCount;
  const magnitude = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 2.5, 5, 10].find((m) => m * magnitude >= raw) ?? 10;
  return step * magnitude;
}

/**
 * The y-axis in display units: covers the data and the whole window with a little air, snapped
 * to round ticks so the axis reads 60, 65, 70 … rather than 57, 64, 71.
 */
export function chartAxis(
  points: readonly ChartPoint[],
  quantity: Quantity,
  unit: TemperatureUnit,
  window: QuantityWindow | undefined,
  /** More values (display units) the axis must show, e.g. a derived dew-point line. */
  extraValues: readonly number[] = [],
): { domain: [number, number]; ticks: number[]; decimals: number } {
  const values: number[] = [...extraValues];
  for (const p of points) if (p.range) values.push(p.range[0], p.range[1]);
  if (window) values.push(toDisplayValue(quantity, window.min, unit), toDisplayValue(quantity, window.max, unit));
  if (values.length === 0) return { domain: [0, 1], ticks: [0, 1], decimals: 0 };
  // A loop, not Math.min(...values): a long range can hold more values than call arguments allow.
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of values) {
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  return niceAxis(lo, hi, displayDecimals(quantity) > 0 ? 2 : 4);
}

/** Round ticks over [lo, hi] with a little air, at least `minSpan` wide (any unit). */
export function niceAxis(lo: number, hi: number, minSpan: number): { domain: [number, number]; ticks: number[]; decimals: number } {
  const pad = Math.max((hi - lo) * 0.05, minSpan / 4);
  const step = niceStep(Math.max(hi - lo + 2 * pad, minSpan), 5);
  const bottom = Math.floor((lo - pad) / step) * step;
  const top = Math.ceil((hi + pad) / step) * step;
  const ticks: number[] = [];
  for (let t = bottom; t <= top + step / 2; t += step) ticks.push(Number(t.toFixed(6)));
  // As many decimals as the step has: 2.5 → 1, 0.25 → 2.
  const decimals = Math.min(3, String(Number(step.toFixed(6))).split(".")[1]?.length ?? 0);
  return { domain: [bottom, top], ticks, decimals };
}

/**
 * How long a reading is taken to stand for: until the next one, but at most 15 minutes (or one
 * bucket, if wider), so a probe that went quiet is not counted as out of window all the while.
 */
export const MAX_COVERAGE_MS = 15 * 60_000;

function coverageMs(timeMs: number, nextTimeMs: number | undefined, bucketMs: number): number {
  const capMs = Math.max(bucketMs, MAX_COVERAGE_MS);
  return nextTimeMs === undefined ? bucketMs : Math.max(bucketMs, Math.min(nextTimeMs - timeMs, capMs));
}

/**
 * Low, high and time out of window (by bucket mean) over a series, in stored units and ms. A
 * bucket out of window counts until the next bucket with data (at most MAX_COVERAGE_MS), so
 * readings sparser than the buckets are not undercounted.
 */
export function summarizeSeries(points: readonly SeriesPoint[], bucketMs: number, window: QuantityWindow | undefined, untilMs = Infinity) {
  if (points.length === 0) return null;
  const sorted = [...points].sort((a, b) => a.timeMs - b.timeMs);
  let minSi = Infinity;
  let maxSi = -Infinity;
  let outMs = 0;
  sorted.forEach((p, i) => {
    minSi = Math.min(minSi, p.min);
    maxSi = Math.max(maxSi, p.max);
    const status = classifyValue(p.mean, window);
    // The newest bucket is still filling: it counts only up to `untilMs` (now, or the range's end).
    if (status === "below" || status === "above") outMs += Math.max(0, Math.min(coverageMs(p.timeMs, sorted[i + 1]?.timeMs, bucketMs), untilMs - p.timeMs));
  });
  return { minSi, maxSi, outMs, hasWindow: window !== undefined };
}

/** Tick marks on the hour, every `stepH` hours, between `fromMs` and `toMs` (local time). */
export function hourTicks(fromMs: number, toMs: number, stepH: number): number[] {
  const start = new Date(fromMs);
  start.setMinutes(0, 0, 0);
  if (start.getTime() < fromMs) start.setHours(start.getHours() + 1);
  while (start.getHours() % stepH !== 0) start.setHours(start.getHours() + 1);
  const ticks: number[] = [];
  for (const t = new Date(start); t.getTime() <= toMs; t.setHours(t.getHours() + stepH)) ticks.push(t.getTime());
  return ticks;
}

/** A run of consecutive buckets whose mean is out of window on the same side: [startMs, endMs). */
export type OutOfWindowStretch = { startMs: number; endMs: number; status: "below" | "above" };

/**
 * The stretches of time a series spent out of its window (by bucket mean), for shading on the
 * chart. Each bucket out of window stands until the next bucket with data (at most
 * MAX_COVERAGE_MS), so readings every 10 minutes on 3-minute buckets make one stretch, while a
 * probe silent for longer, or a bucket back inside, ends it.
 */
export function outOfWindowStretches(points: readonly ChartPoint[], bucketMs: number): OutOfWindowStretch[] {
  const withData = points.filter((p) => p.mean !== null);
  const stretches: OutOfWindowStretch[] = [];
  let current: OutOfWindowStretch | null = null;
  withData.forEach((p, i) => {
    const isOut = p.status === "below" || p.status === "above";
    const endMs = p.timeMs + coverageMs(p.timeMs, withData[i + 1]?.timeMs, bucketMs);
    if (isOut && current && current.status === p.status && p.timeMs <= current.endMs) {
      current.endMs = endMs;
      return;
    }
    if (current) stretches.push(current);
    current = isOut ? { startMs: p.timeMs, endMs, status: p.status as "below" | "above" } : null;
  });
  if (current) stretches.push(current);
  return stretches;
}

/**
 * One bucket's dew point (°C) and vapour-pressure deficit (kPa), worked out with
 * shared/domain/psychrometrics.ts from the bucket's mean air temperature and mean humidity.
 * Buckets with only one of the two, or values the formulas refuse, are left out.
 */
export type DerivedPoint = { timeMs: number; dewPointC: number; vpdKPa: number };

export function derivedPoints(airTemperature: readonly SeriesPoint[], airHumidity: readonly SeriesPoint[]): DerivedPoint[] {
  const rhByTime = new Map(airHumidity.map((p) => [p.timeMs, p.mean]));
  const result: DerivedPoint[] = [];
  for (const t of [...airTemperature].sort((a, b) => a.timeMs - b.timeMs)) {
    const rh = rhByTime.get(t.timeMs);
    if (rh === undefined) continue;
    const dew = dewPointC(t.mean, rh);
    const vpd = vapourPressureDeficitKPa(t.mean, rh);
    if (dew === undefined || vpd === undefined) continue;
    result.push({ timeMs: t.timeMs, dewPointC: dew, vpdKPa: vpd });
  }
  return result;
}

/** Local midnight on or after `timeMs`. */
function nextMidnight(timeMs: number): Date {
  const d = new Date(timeMs);
  const midnight = new Date(d.getFullYear(), d.getMonth(), d.getDate());
  if (midnight.getTime() < timeMs) midnight.setDate(midnight.getDate() + 1);
  return midnight;
}

/** Ticks at local midnight every `stepDays` days (calendar days, so DST does not shift them). */
export function dayTicks(fromMs: number, toMs: number, stepDays: number): number[] {
  const ticks: number[] = [];
  for (const t = nextMidnight(fromMs); t.getTime() <= toMs; t.setDate(t.getDate() + stepDays)) ticks.push(t.getTime());
  return ticks;
}

/**
 * The time axis for a range: clock times on the hour for a day or so, then whole days, spaced so
 * a tablet's width holds the labels (24 h: every 6 h; 7 d: daily; 30 d: every 5 days).
 */
export function timeAxis(fromMs: number, toMs: number): { ticks: number[]; format: (timeMs: number) => string } {
  const spanMs = toMs - fromMs;
  const HOUR_MS = 3_600_000;
  if (spanMs <= 36 * HOUR_MS) return { ticks: hourTicks(fromMs, toMs, spanMs <= 12 * HOUR_MS ? 2 : 6), format: formatClockTime };
  const days = spanMs / (24 * HOUR_MS);
  const stepDays = days <= 8 ? 1 : days <= 16 ? 2 : days <= 45 ? 5 : days <= 120 ? 14 : 30;
  const format =
    stepDays === 1
      ? (t: number) => new Date(t).toLocaleDateString(undefined, { weekday: "short", day: "numeric" })
      : (t: number) => new Date(t).toLocaleDateString(undefined, { day: "numeric", month: "short" });
  return { ticks: dayTicks(fromMs, toMs, stepDays), format };
}
