/**
 * Batch arithmetic: strike rate, losses, days from sticking to callus and roots (PRODUCT.md §3).
 * Counts are whole cuttings; dates are calendar dates "YYYY-MM-DD" (the nursery's local date).
 */

/** A batch's counts so far: cuttings stuck, rooted, and lost (rotted, mouldy, dead). */
export interface BatchCounts {
  stuck: number;
  rooted: number;
  lost: number;
}

export type BatchRefusal = "not-a-count" | "nothing-stuck" | "counts-exceed-stuck" | "invalid-date" | "date-before-sticking";

export type BatchResult<T> = { ok: true; value: T } | { ok: false; reason: BatchRefusal; detail: string };

export interface BatchTally extends BatchCounts {
  /** Neither rooted nor lost yet: stuck − rooted − lost. */
  pending: number;
  /** rooted / stuck, 0–1; null when nothing is stuck. */
  strikeRate: number | null;
  /** lost / stuck, 0–1; null when nothing is stuck. */
  lossRate: number | null;
}

function isCount(n: unknown): n is number {
  return typeof n === "number" && Number.isSafeInteger(n) && n >= 0;
}

/**
 * Checks that the counts are whole numbers ≥ 0 and add up: rooted + lost ≤ stuck.
 * Zero stuck with zero rooted and lost is valid (a batch just created).
 */
export function checkBatchCounts(counts: BatchCounts): BatchResult<BatchCounts> {
  for (const key of ["stuck", "rooted", "lost"] as const) {
    if (!isCount(counts[key])) return { ok: false, reason: "not-a-count", detail: `${key} must be a whole number ≥ 0, got ${String(counts[key])}` };
  }
  if (counts.rooted + counts.lost > counts.stuck) {
    return {
      ok: false,
      reason: "counts-exceed-stuck",
      detail: `${counts.rooted} rooted + ${counts.lost} lost is more than the ${counts.stuck} stuck`,
    };
  }
  return { ok: true, value: counts };
}

/** Counts, pending and rates of one batch; refused when the counts do not add up. */
export function batchTally(counts: BatchCounts): BatchResult<BatchTally> {
  const checked = checkBatchCounts(counts);
  if (!checked.ok) return checked;
  const { stuck, rooted, lost } = counts;
  return {
    ok: true,
    value: {
      stuck,
      rooted,
      lost,
      pending: stuck - rooted - lost,
      strikeRate: stuck > 0 ? rooted / stuck : null,
      lossRate: stuck > 0 ? lost / stuck : null,
    },
  };
}

/** Strike rate = rooted / stuck (the trade's own measure), 0–1. Refused when nothing is stuck or the counts do not add up. */
export function strikeRate(counts: BatchCounts): BatchResult<number> {
  const tally = batchTally(counts);
  if (!tally.ok) return tally;
  if (tally.value.strikeRate === null) return { ok: false, reason: "nothing-stuck", detail: "no cuttings are stuck yet" };
  return { ok: true, value: tally.value.strikeRate };
}

/** Loss rate = lost / stuck, 0–1. Refused as strikeRate is. */
export function lossRate(counts: BatchCounts): BatchResult<number> {
  const tally = batchTally(counts);
  if (!tally.ok) return tally;
  if (tally.value.lossRate === null) return { ok: false, reason: "nothing-stuck", detail: "no cuttings are stuck yet" };
  return { ok: true, value: tally.value.lossRate };
}

/**
 * Strike rate over several batches (by variety, bench or season): Σ rooted / Σ stuck, so big batches
 * weigh more than small ones. Refused when any batch's counts do not add up, or nothing is stuck.
 */
export function pooledStrikeRate(batches: readonly BatchCounts[]): BatchResult<number> {
  const total: BatchCounts = { stuck: 0, rooted: 0, lost: 0 };
  for (const [i, batch] of batches.entries()) {
    const checked = checkBatchCounts(batch);
    if (!checked.ok) return { ...checked, detail: `batch ${i}: ${checked.detail}` };
    total.stuck += batch.stuck;
    total.rooted += batch.rooted;
    total.lost += batch.lost;
  }
  return strikeRate(total);
}

const DATE_PATTERN = /^(\d{4})-(\d{2})-(\d{2})$/;

/** A calendar date "YYYY-MM-DD" → its day number (days since 1970-01-01), or undefined if it is no real date. */
export function calendarDayNumber(date: string): number | undefined {
  const match = DATE_PATTERN.exec(date);
  if (!match) return undefined;
  const [year, month, day] = [Number(match[1]), Number(match[2]), Number(match[3])];
  const ms = Date.UTC(year, month - 1, day);
  const back = new Date(ms);
  if (back.getUTCFullYear() !== year || back.getUTCMonth() !== month - 1 || back.getUTCDate() !== day) return undefined;
  return Math.round(ms / 86_400_000);
}

/** Whole calendar days from `fromDate` to `toDate` (both "YYYY-MM-DD"); negative when toDate is earlier. */
export function daysBetween(fromDate: string, toDate: string): BatchResult<number> {
  const from = calendarDayNumber(fromDate);
  const to = calendarDayNumber(toDate);
  if (from === undefined) return { ok: false, reason: "invalid-date", detail: `${JSON.stringify(fromDate)} is not a date YYYY-MM-DD` };
  if (to === undefined) return { ok: false, reason: "invalid-date", detail: `${JSON.stringify(toDate)} is not a date YYYY-MM-DD` };
  return { ok: true, value: to - from };
}

/**
 * The stages a batch of cuttings goes through, in order (issue 6 §1): stuck → callused → root
 * initials → rooted → potted on. An observation at a later stage implies the earlier ones (roots
 * seen → it has callused). The order is the trade's ordinary sequence for stem cuttings (common
 * practice). "lost" is not on this path: see BATCH_STAGES.
 */
export const PROPAGATION_STAGES = ["stuck", "callused", "root-initials", "rooted", "potted-on"] as const;
export type PropagationStage = (typeof PROPAGATION_STAGES)[number];

/** Every stage a batch can be recorded at: the propagation path, plus "lost" (the whole batch failed). */
export const BATCH_STAGES = [...PROPAGATION_STAGES, "lost"] as const;
export type BatchStage = (typeof BATCH_STAGES)[number];

/** Whether `stage` is `target` or later on the path. "lost" and unknown stages reach nothing. */
export function hasReachedStage(stage: string, target: PropagationStage): boolean {
  const index = PROPAGATION_STAGES.indexOf(stage as PropagationStage);
  return index >= 0 && index >= PROPAGATION_STAGES.indexOf(target);
}

export interface StageObservation {
  /** "YYYY-MM-DD" */
  date: string;
  stage: string;
}

/**
 * Days from sticking (`stuckOnDate`) to the first observation that `reached` accepts; null when no
 * observation does yet. Observations in any order. Refused when a date is invalid or an
 * observation predates the sticking.
 */
export function daysToFirst<T extends { date: string }>(
  stuckOnDate: string,
  observations: readonly T[],
  reached: (observation: T) => boolean,
): BatchResult<number | null> {
  if (calendarDayNumber(stuckOnDate) === undefined) {
    return { ok: false, reason: "invalid-date", detail: `${JSON.stringify(stuckOnDate)} is not a date YYYY-MM-DD` };
  }
  let first: number | null = null;
  for (const observation of observations) {
    const days = daysBetween(stuckOnDate, observation.date);
    if (!days.ok) return days;
    if (days.value < 0) {
      return { ok: false, reason: "date-before-sticking", detail: `observation on ${observation.date} is before sticking on ${stuckOnDate}` };
    }
    if (reached(observation) && (first === null || days.value < first)) first = days.value;
  }
  return { ok: true, value: first };
}

/** Days from sticking to the first observation of `target` or a later stage (e.g. "callused", "root-initials"). */
export function daysToFirstStage(
  stuckOnDate: string,
  observations: readonly StageObservation[],
  target: PropagationStage,
): BatchResult<number | null> {
  return daysToFirst(stuckOnDate, observations, (o) => hasReachedStage(o.stage, target));
}

/** An observation as the batch arithmetic reads it: its date, stage and (optional) counts so far. */
export interface CountedObservation extends StageObservation {
  /** Cuttings rooted so far (a running total as seen that day), or null when not counted. */
  rooted: number | null;
  /** Cuttings lost so far (a running total), or null when not counted. */
  lost: number | null;
  /** Tie-break between observations of one date: later recorded wins (ms since 1970). */
  recordedAtMs?: number;
}

function byDateThenRecorded<T extends { date: string; recordedAtMs?: number }>(a: T, b: T): number {
  return a.date < b.date ? -1 : a.date > b.date ? 1 : (a.recordedAtMs ?? 0) - (b.recordedAtMs ?? 0);
}

/**
 * The batch's stage now: that of the latest observation (by date, then by when it was recorded),
 * or "stuck" when there is none. The latest wins even when it names an earlier stage than one
 * before it: the grower's latest look is the best knowledge (days-to figures still use the first).
 */
export function currentStage(observations: readonly (StageObservation & { recordedAtMs?: number })[]): string {
  const latest = [...observations].sort(byDateThenRecorded).at(-1);
  return latest?.stage ?? "stuck";
}

/**
 * The counts as of the latest observation: observation counts are running totals ("so far"), so
 * the latest observation that counted each wins (rooted and lost independently); 0 when never counted.
 * Running totals rather than increments keep a re-sent or edited observation from counting twice.
 */
export function latestCounts(observations: readonly CountedObservation[]): { rooted: number; lost: number } {
  let rooted: CountedObservation | undefined;
  let lost: CountedObservation | undefined;
  for (const o of [...observations].sort(byDateThenRecorded)) {
    if (o.rooted !== null) rooted = o;
    if (o.lost !== null) lost = o;
  }
  return { rooted: rooted?.rooted ?? 0, lost: lost?.lost ?? 0 };
}

export interface DaysSummary {
  /** How many batches reached the stage. */
  reached: number;
  /** How many batches were looked at. */
  of: number;
  /** Mean and median days of those that reached it; null when none did. */
  meanDays: number | null;
  medianDays: number | null;
}

/**
 * Days-to figures of several batches (e.g. days to callus of every batch of a variety): how many
 * reached it, mean and median of those that did. null entries (not reached yet) count in `of` only.
 * Median: the middle value, or the mean of the two middle values of an even count.
 */
export function summariseDays(values: readonly (number | null)[]): DaysSummary {
  const reached = values.filter((v): v is number => v !== null && Number.isFinite(v)).sort((a, b) => a - b);
  const n = reached.length;
  if (n === 0) return { reached: 0, of: values.length, meanDays: null, medianDays: null };
  const mid = Math.floor(n / 2);
  const median = n % 2 === 1 ? (reached[mid] as number) : ((reached[mid - 1] as number) + (reached[mid] as number)) / 2;
  return { reached: n, of: values.length, meanDays: reached.reduce((s, v) => s + v, 0) / n, medianDays: median };
}

/**
 * The share of time inside the window over several stretches (batches, or the benches one batch
 * sat on), 0–100: Σ inside / Σ time with data, so long stretches weigh more. null when no stretch
 * has data.
 */
export function pooledInsidePct(parts: readonly { insideMs: number; dataMs: number }[]): number | null {
  let inside = 0;
  let data = 0;
  for (const p of parts) {
    if (!(p.dataMs > 0)) continue;
    inside += p.insideMs;
    data += p.dataMs;
  }
  return data > 0 ? (100 * inside) / data : null;
}

/**
 * The placement a batch was in at an instant: the one whose [fromMs, toMs) holds it (toMs null: it
 * is still there). Outside every placement (before the first, or in a gap the records leave), the
 * latest one begun by then, else the first. undefined only for no placements.
 */
export function placementAt<P extends { fromMs: number; toMs: number | null }>(placements: readonly P[], timeMs: number): P | undefined {
  const sorted = [...placements].sort((a, b) => a.fromMs - b.fromMs);
  const holding = sorted.find((p) => p.fromMs <= timeMs && (p.toMs === null || timeMs < p.toMs));
  return holding ?? sorted.filter((p) => p.fromMs <= timeMs).at(-1) ?? sorted[0];
}
