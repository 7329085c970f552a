/**
 * Time in window over irregular samples with gaps, degree-hours outside the window, and night
 * min/max (issue 3 item 5; the morning walk-through card, PRODUCT.md §5).
 *
 * Time model (sample-and-hold, as in window-evaluation.ts): a sample's value stands from its time
 * until the next sample. A gap between two samples longer than the limit
 * (`gapMultiple × expectedIntervalMs`) is no data for its whole length — never inside. So is the
 * time before the first sample. After the last sample the silence is still open, so its value
 * stands for at most the limit, then no data (provisional: a later sample may turn it into a
 * long gap). Pass samples from before and after the period too: they decide the holds across its
 * edges, and then adjacent periods add up exactly to the period that spans them.
 */
import type { QuantityWindow } from "../schemas/windows.js";
import { classifyValue } from "./window-status.js";

/** A half-open span of time [fromMs, toMs), ms since 1970 (UTC). `toMs` should not lie after now. */
export interface Period {
  fromMs: number;
  toMs: number;
}

export interface TimedValue {
  timeMs: number;
  value: number;
}

/** When a silence between samples counts as no data. */
export interface GapRule {
  /** The probe's reporting interval, ms. */
  expectedIntervalMs: number;
  /** A gap longer than this many intervals is no data. Default 3. */
  gapMultiple?: number;
}

export const DEFAULT_GAP_MULTIPLE = 3;

export type CoverageStatus = "inside" | "below" | "above" | "no-data";

/** A stretch of the period with one status; adjacent stretches never share a status. */
export interface WindowSegment {
  startMs: number;
  endMs: number;
  status: CoverageStatus;
}

export interface TimeInWindow {
  periodMs: number;
  insideMs: number;
  belowMs: number;
  aboveMs: number;
  noDataMs: number;
  /** The same four, in minutes (not rounded). */
  minutes: { inside: number; below: number; above: number; noData: number };
  /** Inside as a share of the whole period, 0–100 (no data counts against it); null for an empty period. */
  insidePctOfPeriod: number | null;
  /** Inside as a share of the time with data, 0–100; null when there is no data. */
  insidePctOfData: number | null;
  /** ∫ (min − value) dt where value < min, in the quantity's stored unit × hours (°C·h for temperatures). */
  degreeHoursBelowMin: number;
  /** ∫ (value − max) dt where value > max, in stored unit × hours. */
  degreeHoursAboveMax: number;
}

/** The longest silence that still counts as data, ms: gapMultiple (default 3) × expectedIntervalMs. */
export function maxGapMs(rule: GapRule): number {
  return (rule.gapMultiple ?? DEFAULT_GAP_MULTIPLE) * rule.expectedIntervalMs;
}

interface Hold {
  startMs: number;
  endMs: number;
  /** null = no data */
  value: number | null;
}

/** The period cut into stretches of one held value or of no data, in time order, covering it exactly. */
function holds(samples: readonly TimedValue[], period: Period, rule: GapRule): Hold[] {
  const { fromMs, toMs } = period;
  if (!(toMs > fromMs)) return [];
  const limitMs = maxGapMs(rule);
  const ordered = samples
    .filter((s) => Number.isFinite(s.value) && Number.isFinite(s.timeMs))
    .sort((a, b) => a.timeMs - b.timeMs);
  const out: Hold[] = [];
  const push = (startMs: number, endMs: number, value: number | null) => {
    const start = Math.max(startMs, fromMs);
    const end = Math.min(endMs, toMs);
    if (end > start) out.push({ startMs: start, endMs: end, value });
  };

  const first = ordered[0];
  if (first === undefined) {
    push(fromMs, toMs, null);
    return out;
  }
  push(fromMs, first.timeMs, null);
  for (let i = 0; i < ordered.length; i++) {
    const sample = ordered[i] as TimedValue;
    if (sample.timeMs >= toMs) break;
    const next = ordered[i + 1];
    if (next !== undefined && next.timeMs === sample.timeMs) continue; // the later of equal times stands
    if (next === undefined) {
      // The silence after the last sample is still open: its value stands for at most the limit.
      push(sample.timeMs, sample.timeMs + limitMs, sample.value);
      push(sample.timeMs + limitMs, toMs, null);
    } else {
      push(sample.timeMs, next.timeMs, next.timeMs - sample.timeMs > limitMs ? null : sample.value);
    }
  }
  return out;
}

function statusOf(value: number | null, window: Pick<QuantityWindow, "min" | "max">): CoverageStatus {
  if (value === null) return "no-data";
  const status = classifyValue(value, window);
  return status === "unknown" ? "no-data" : status;
}

/**
 * The state over time within `period`: inside, below, above or no data, merged into maximal
 * stretches. Samples in any order; non-finite values are dropped. Empty for an empty period.
 */
export function windowSegments(
  samples: readonly TimedValue[],
  window: Pick<QuantityWindow, "min" | "max">,
  period: Period,
  rule: GapRule,
): WindowSegment[] {
  const segments: WindowSegment[] = [];
  for (const hold of holds(samples, period, rule)) {
    const status = statusOf(hold.value, window);
    const last = segments[segments.length - 1];
    if (last !== undefined && last.status === status && last.endMs === hold.startMs) last.endMs = hold.endMs;
    else segments.push({ startMs: hold.startMs, endMs: hold.endMs, status });
  }
  return segments;
}

/**
 * Time inside, below and above the window and without data over `period` (the four add up to
 * the period), the share inside, and degree-hours below the minimum and above the maximum.
 * Samples in any order, in stored units; see the module comment for gaps. An empty or reversed
 * period gives zeros and null shares.
 */
export function timeInWindow(
  samples: readonly TimedValue[],
  window: Pick<QuantityWindow, "min" | "max">,
  period: Period,
  rule: GapRule,
): TimeInWindow {
  let insideMs = 0;
  let belowMs = 0;
  let aboveMs = 0;
  let noDataMs = 0;
  let belowUnitMs = 0;
  let aboveUnitMs = 0;
  for (const hold of holds(samples, period, rule)) {
    const durationMs = hold.endMs - hold.startMs;
    const status = statusOf(hold.value, window);
    if (status === "inside") insideMs += durationMs;
    else if (status === "below") {
      belowMs += durationMs;
      belowUnitMs += (window.min - (hold.value as number)) * durationMs;
    } else if (status === "above") {
      aboveMs += durationMs;
      aboveUnitMs += ((hold.value as number) - window.max) * durationMs;
    } else noDataMs += durationMs;
  }
  const periodMs = Math.max(0, period.toMs - period.fromMs);
  const dataMs = insideMs + belowMs + aboveMs;
  return {
    periodMs,
    insideMs,
    belowMs,
    aboveMs,
    noDataMs,
    minutes: { inside: insideMs / 60_000, below: belowMs / 60_000, above: aboveMs / 60_000, noData: noDataMs / 60_000 },
    insidePctOfPeriod: periodMs > 0 ? (100 * insideMs) / periodMs : null,
    insidePctOfData: dataMs > 0 ? (100 * insideMs) / dataMs : null,
    degreeHoursBelowMin: belowUnitMs / 3_600_000,
    degreeHoursAboveMax: aboveUnitMs / 3_600_000,
  };
}

export interface PeriodExtremes {
  min: TimedValue;
  max: TimedValue;
  /** How many samples the period held. */
  count: number;
}

/**
 * Lowest and highest sample within `period` (fromMs ≤ t < toMs), e.g. last night's min/max on the
 * walk-through card; the caller picks the night's bounds in the site's time zone. The earliest
 * sample wins a tie. Non-finite values are skipped; null when no sample falls in the period.
 */
export function nightMinMax(samples: readonly TimedValue[], period: Period): PeriodExtremes | null {
  let min: TimedValue | undefined;
  let max: TimedValue | undefined;
  let count = 0;
  for (const sample of samples) {
    if (!Number.isFinite(sample.value) || !(sample.timeMs >= period.fromMs && sample.timeMs < period.toMs)) continue;
    count++;
    if (min === undefined || sample.value < min.value || (sample.value === min.value && sample.timeMs < min.timeMs)) min = sample;
    if (max === undefined || sample.value > max.value || (sample.value === max.value && sample.timeMs < max.timeMs)) max = sample;
  }
  if (min === undefined || max === undefined) return null;
  return { min: { timeMs: min.timeMs, value: min.value }, max: { timeMs: max.timeMs, value: max.value }, count };
}
