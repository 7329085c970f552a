import { displayUnit, formatQuantity, type TemperatureUnit } from "../../shared/domain/units.js";
import type { Quantity } from "../../shared/schemas/quantities.js";
import type { QuantityWindow } from "../../shared/schemas/windows.js";

/**
 * A stored value formatted by the shared `formatQuantity`, split into its number and unit so the
 * number can be drawn large and the unit small. No conversion happens here.
 */
export function formatValueParts(quantity: Quantity, valueSi: number, unit: TemperatureUnit) {
  const text = formatQuantity(quantity, valueSi, unit);
  const unitLabel = displayUnit(quantity, unit);
  const number = text.endsWith(` ${unitLabel}`) ? text.slice(0, -(unitLabel.length + 1)) : text;
  return { text, number, unit: unitLabel };
}

/** A window as the user reads it, e.g. "70.0–80.0 °F". */
export function formatWindowRange(window: Pick<QuantityWindow, "quantity" | "min" | "max">, unit: TemperatureUnit): string {
  const min = formatValueParts(window.quantity, window.min, unit);
  const max = formatValueParts(window.quantity, window.max, unit);
  return `${min.number}–${max.number} ${max.unit}`;
}
