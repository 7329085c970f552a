import type { AlertView } from "../../../../shared/schemas/alerts.js";
import { WINDOWED_QUANTITIES, type WindowedQuantity } from "../../../../shared/schemas/quantities.js";
import { alertQuantity } from "../../../lib/alert-words";

const HOUR_MS = 3_600_000;
const MINUTE_MS = 60_000;

/**
 * The stretch of time an alert's chart shows. A cleared alert: the excursion with half as much
 * again either side (at least 2 h, at most 6 h). An alert still open: from two hours before it
 * to now (`toMs` left out, so the series follows the clock). Nothing here moves with the clock
 * while the alert stays open, so the query key stays put.
 */
export function excursionRange(alert: Pick<AlertView, "sinceMs" | "clearedAtMs">, nowMs: number): { fromMs: number; toMs?: number } {
  // At least 2 h either side: enough lead-up to see the fall, and the time axis gets a tick or two.
  const padMs = alert.clearedAtMs === null ? 2 * HOUR_MS : Math.min(6 * HOUR_MS, Math.max(2 * HOUR_MS, (alert.clearedAtMs - alert.sinceMs) / 2));
  const fromMs = Math.floor((alert.sinceMs - padMs) / MINUTE_MS) * MINUTE_MS;
  if (alert.clearedAtMs === null) return { fromMs };
  const toMs = Math.ceil((alert.clearedAtMs + padMs) / MINUTE_MS) * MINUTE_MS;
  return toMs < nowMs ? { fromMs, toMs } : { fromMs };
}

/** The quantities worth charting for an alert: its own; air temperature and humidity for condensation; all for a silent sensor. */
export function excursionQuantities(alert: AlertView): WindowedQuantity[] {
  const quantity = alertQuantity(alert);
  if (quantity) return [quantity];
  if (alert.kind === "condensation") return ["air.temperature", "air.humidity"];
  return [...WINDOWED_QUANTITIES];
}
