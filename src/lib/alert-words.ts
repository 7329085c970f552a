import { celsiusDeltaToFahrenheit, formatQuantity, type TemperatureUnit } from "../../shared/domain/units.js";
import type { AlertKind, AlertPhase, AlertView } from "../../shared/schemas/alerts.js";
import { formatWindowRange } from "./display-value";
import { formatClockTime } from "./format-time";
import type { WindowedQuantity } from "../../shared/schemas/quantities.js";
import { QUANTITY_LABELS, describeAlert } from "./quantity-labels";

/*
 * How an alert reads on a screen: the life-cycle names of PRODUCT.md §3 and the value in the
 * user's unit. Shared by the dashboard's bench cards and the alerts pages.
 */

export const PHASE_LABELS: Record<AlertPhase, string> = {
  watching: "Watching",
  raised: "Raised",
  acknowledged: "Acknowledged",
  cleared: "Cleared",
};

/** What each phase means for the person reading it. */
export const PHASE_DESCRIPTIONS: Record<AlertPhase, string> = {
  watching: "Out of window; the hold-off delay is running and nobody has been told yet",
  raised: "The people on duty have been told; nobody has taken it yet",
  acknowledged: "Someone has taken it; reminders have stopped",
  cleared: "Back inside the window",
};

export const OPEN_PHASES = ["watching", "raised", "acknowledged"] as const satisfies readonly AlertPhase[];

export const KIND_LABELS: Record<AlertKind, string> = {
  window: "Out of window",
  condensation: "Condensation risk",
  "sensor-silent": "Sensor silent",
};

/** The alert's quantity when it is one with a rooting window (window alerts), else null. */
export function alertQuantity(alert: Pick<AlertView, "quantity">): WindowedQuantity | null {
  return alert.quantity !== null && alert.quantity in QUANTITY_LABELS ? (alert.quantity as WindowedQuantity) : null;
}

export function isOpenAlert(alert: Pick<AlertView, "phase">): boolean {
  return alert.phase !== "cleared";
}

/** One line for a bench card: "Raised 03:12 · Air too cold", "Watching: hold-off running · …". */
export function describeAlertPhase(alert: AlertView): string {
  switch (alert.phase) {
    case "watching":
      return "Watching: hold-off running";
    case "raised":
      return `Raised ${formatClockTime(alert.raisedAtMs ?? alert.sinceMs)}`;
    case "acknowledged":
      return alert.acknowledgedByName ? `Acknowledged by ${alert.acknowledgedByName}` : "Acknowledged";
    case "cleared":
      return `Cleared ${formatClockTime(alert.clearedAtMs ?? alert.sinceMs)}`;
  }
}

/**
 * A dew-point margin (a temperature *difference*, stored in °C) in the user's unit: °F = °C × 1.8,
 * no offset (shared/domain/units.ts celsiusDeltaToFahrenheit). "1.8 °F", never "35.2 °F".
 */
export function formatTemperatureDifference(deltaC: number, unit: TemperatureUnit): string {
  const shown = (unit === "F" ? celsiusDeltaToFahrenheit(deltaC) : deltaC).toFixed(1);
  return `${/^-0(\.0+)?$/.test(shown) ? shown.slice(1) : shown} ${unit === "F" ? "°F" : "°C"}`;
}

/**
 * A stored alert value as the user reads it: "59.0 °F" for a window alert, "1.8 °F above the dew
 * point" for condensation (a margin), null when the alert carries none (a silent sensor).
 */
export function formatAlertValue(alert: Pick<AlertView, "kind" | "quantity">, valueSi: number | null, unit: TemperatureUnit): string | null {
  if (valueSi === null) return null;
  if (alert.kind === "condensation") return `${formatTemperatureDifference(valueSi, unit)} above the dew point`;
  const quantity = alertQuantity(alert);
  return quantity ? formatQuantity(quantity, valueSi, unit) : null;
}

/** The window the alert was judged against, e.g. "70.0–80.0 °F"; null when it has none. */
export function formatAlertWindow(alert: Pick<AlertView, "kind" | "quantity" | "windowMin" | "windowMax">, unit: TemperatureUnit): string | null {
  const quantity = alertQuantity(alert);
  if (alert.kind !== "window" || !quantity || alert.windowMin === null || alert.windowMax === null) return null;
  return formatWindowRange({ quantity, min: alert.windowMin, max: alert.windowMax }, unit);
}

/** The alert's one-line name, from the shared words ("Air too cold", "Condensation risk"). */
export function alertTitle(alert: AlertView): string {
  return describeAlert(alert);
}
