import { WINDOWED_QUANTITIES, type WindowedQuantity } from "../../../../shared/schemas/quantities.js";
import type { WindowStatus } from "../../../../shared/schemas/windows.js";
import type { BenchSummary, LatestReading } from "../../../../shared/schemas/zones.js";
import { describeStatus, isOutOfWindow } from "../../../lib/quantity-labels";

export function findLatest(bench: BenchSummary, quantity: WindowedQuantity): LatestReading | undefined {
  return bench.latest.find((l) => l.quantity === quantity);
}

/** The out-of-window quantities of a bench in card order, with their words ("Too cold"). */
export function listProblems(bench: BenchSummary): { quantity: WindowedQuantity; status: WindowStatus; label: string }[] {
  return WINDOWED_QUANTITIES.flatMap((quantity) => {
    const reading = findLatest(bench, quantity);
    if (!reading || !isOutOfWindow(reading.status)) return [];
    return [{ quantity, status: reading.status, label: describeStatus(quantity, reading.status) }];
  });
}

/** The bench's overall status in words, for its card header. */
export function describeBenchStatus(bench: BenchSummary): string {
  if (bench.status === "inside") return "All in window";
  if (isOutOfWindow(bench.status)) return "Out of window";
  const hasAnyReading = WINDOWED_QUANTITIES.some((q) => findLatest(bench, q));
  return hasAnyReading ? "No window set" : "No readings yet";
}
