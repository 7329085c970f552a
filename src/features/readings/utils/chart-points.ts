import { displayDecimals, toDisplayValue, type TemperatureUnit } from "../../../../shared/domain/units.js";
import { classifyValue } from "../../../../shared/domain/window-status.js";
import type { Quantity } from "../../../../shared/schemas/quantities.js";
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
): { domain: [number, number]; ticks: number[]; decimals: number } {
  const values: number[] = [];
  for (const p of points) if (p.range) values.push(p.range[0], p.range[1]);
  if (window) values.push(toDisplayValue(quantity, window.min, unit), toDisplayValue(quantity, window.max, unit));
  if (values.length === 0) return { domain: [0, 1], ticks: [0, 1], decimals: 0 };
  const lo = Math.min(...values);
  const hi = Math.max(...values);
  const minSpan = displayDecimals(quantity) > 0 ? 2 : 4;
  const pad = Math.max((hi - lo) * 0.05, minSpan / 4);
  const step = niceStep(Math.max(hi - lo + 2 * pad, minSpan), 5);
  const bottom = Math.floor((lo - pad) / step) * step;
  const top = Math.ceil((hi + pad) / step) * step;
  const ticks: number[] = [];
  for (let t = bottom; t <= top + step / 2; t += step) ticks.push(Number(t.toFixed(6)));
  const decimals = Number.isInteger(step) ? 0 : 1;
  return { domain: [bottom, top], ticks, decimals };
}

/** Low, high and time out of window (by bucket mean) over a series, in stored units and ms. */
export function summarizeSeries(points: readonly SeriesPoint[], bucketMs: number, window: QuantityWindow | undefined) {
  if (points.length === 0) return null;
  let minSi = Infinity;
  let maxSi = -Infinity;
  let outMs = 0;
  for (const p of points) {
    minSi = Math.min(minSi, p.min);
    maxSi = Math.max(maxSi, p.max);
    const status = classifyValue(p.mean, window);
    if (status === "below" || status === "above") outMs += bucketMs;
  }
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
