import type { BatchStage } from "../../../../shared/domain/batch.js";
import { FLAG_LABELS, STAGE_LABELS, type ObservationFlag } from "../../../../shared/schemas/batches.js";

/** A rate 0–1 as whole percent, "82 %"; a dash when there is none. */
export function formatRate(rate: number | null | undefined): string {
  return rate === null || rate === undefined ? "—" : `${Math.round(rate * 100)} %`;
}

/** A share 0–100 as whole percent. */
export function formatPct(pct: number | null | undefined): string {
  return pct === null || pct === undefined ? "—" : `${Math.round(pct)} %`;
}

/** "12 days", "1 day", or a dash. */
export function formatDays(days: number | null | undefined): string {
  if (days === null || days === undefined) return "—";
  const rounded = Math.round(days * 10) / 10;
  return rounded === 1 ? "1 day" : `${rounded} days`;
}

/** A calendar date "2025-01-15" as "15 Jan 2025", read as a date (no time zone shift). */
export function formatCalendarDate(date: string): string {
  const [y, m, d] = date.split("-").map(Number);
  if (!y || !m || !d) return date;
  return new Date(Date.UTC(y, m - 1, d)).toLocaleDateString(undefined, { day: "numeric", month: "short", year: "numeric", timeZone: "UTC" });
}

export function stageLabel(stage: BatchStage): string {
  return STAGE_LABELS[stage];
}

/** The flags in words, "mould, rot"; "no problems" when none. */
export function describeFlags(flags: readonly ObservationFlag[]): string {
  return flags.length === 0 ? "no problems flagged" : flags.map((f) => FLAG_LABELS[f].toLowerCase()).join(", ");
}
