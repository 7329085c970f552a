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
 * The stages a cutting goes through, in order. An observation at a later stage implies the
 * earlier ones (roots seen → it has callused).
 */
export const PROPAGATION_STAGES = ["stuck", "callus", "root-initials", "rooted"] as const;
export type PropagationStage = (typeof PROPAGATION_STAGES)[number];

/** Whether `stage` is `target` or later. Unknown stages (e.g. "bud-break", a separate flag) reach nothing. */
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

/** Days from sticking to the first observation of `target` or a later stage (e.g. "callus", "root-initials"). */
export function daysToFirstStage(
  stuckOnDate: string,
  observations: readonly StageObservation[],
  target: PropagationStage,
): BatchResult<number | null> {
  return daysToFirst(stuckOnDate, observations, (o) => hasReachedStage(o.stage, target));
}
