import type { Quantity } from "../schemas/quantities.js";

/** The temperature scale a user reads values in. */
export type TemperatureUnit = "C" | "F";

/** °C → °F (NIST SP 811, appendix B: t/°F = 1.8 · t/°C + 32). */
export function celsiusToFahrenheit(tC: number): number {
  return tC * 1.8 + 32;
}

/** °F → °C (NIST SP 811, appendix B: t/°C = (t/°F − 32) / 1.8). */
export function fahrenheitToCelsius(tF: number): number {
  return (tF - 32) / 1.8;
}

/** K → °C (NIST SP 811: T/K = t/°C + 273.15). */
export function kelvinToCelsius(tK: number): number {
  return tK - 273.15;
}

/** °C → K (NIST SP 811: T/K = t/°C + 273.15). */
export function celsiusToKelvin(tC: number): number {
  return tC + 273.15;
}

/** A temperature difference (a hysteresis band, a margin) in °C → °F: no offset. */
export function celsiusDeltaToFahrenheit(deltaC: number): number {
  return deltaC * 1.8;
}

/** A temperature difference in °F → °C. */
export function fahrenheitDeltaToCelsius(deltaF: number): number {
  return deltaF / 1.8;
}

/** True for the two temperature quantities (stored in °C, shown in °C or °F). */
export function isTemperature(quantity: Quantity): boolean {
  return quantity === "air.temperature" || quantity === "medium.temperature";
}

/** A stored (SI) value as the user reads it: °C or °F for temperatures, percent for the rest. */
export function toDisplayValue(quantity: Quantity, valueSi: number, unit: TemperatureUnit): number {
  if (isTemperature(quantity)) return unit === "F" ? celsiusToFahrenheit(valueSi) : valueSi;
  if (quantity === "medium.moisture") return valueSi * 100;
  return valueSi;
}

/** A value typed by a user back into stored (SI) units. */
export function fromDisplayValue(quantity: Quantity, displayValue: number, unit: TemperatureUnit): number {
  if (isTemperature(quantity)) return unit === "F" ? fahrenheitToCelsius(displayValue) : displayValue;
  if (quantity === "medium.moisture") return displayValue / 100;
  return displayValue;
}

/** The unit label shown beside a value. */
export function displayUnit(quantity: Quantity, unit: TemperatureUnit): string {
  if (isTemperature(quantity)) return unit === "F" ? "°F" : "°C";
  if (quantity === "air.humidity") return "% RH";
  if (quantity === "medium.moisture") return "% VWC";
  return "%";
}

/** Decimals shown per quantity: one for temperatures, whole percent for the rest. */
export function displayDecimals(quantity: Quantity): number {
  return isTemperature(quantity) ? 1 : 0;
}

/** A stored value formatted for display, e.g. "75.2 °F", "82 % RH", "41 % VWC". */
export function formatQuantity(quantity: Quantity, valueSi: number, unit: TemperatureUnit): string {
  const shown = toDisplayValue(quantity, valueSi, unit).toFixed(displayDecimals(quantity));
  // toFixed can give "-0.0"; a grower should never read a negative zero.
  const clean = /^-0(\.0+)?$/.test(shown) ? shown.slice(1) : shown;
  return `${clean} ${displayUnit(quantity, unit)}`;
}

/**
 * The SenML unit symbols (RFC 8428 §12.1) accepted on ingest for each quantity (PRODUCT.md §4).
 * The first is the stored unit; "K" is converted to "Cel". Medium moisture is a ratio 0–1 ("/"):
 * SenML has no volumetric-water-content unit.
 */
export const ACCEPTED_SENML_UNITS: Record<Quantity, readonly string[]> = {
  "air.temperature": ["Cel", "K"],
  "air.humidity": ["%RH"],
  "medium.temperature": ["Cel", "K"],
  "medium.moisture": ["/"],
  battery: ["%EL"],
};

/** Whether `unit` (a SenML symbol, case-sensitive) is accepted for `quantity`; a missing unit never is. */
export function isAcceptedUnit(quantity: Quantity, unit: string | undefined): boolean {
  return unit !== undefined && ACCEPTED_SENML_UNITS[quantity].includes(unit);
}

/**
 * A value sent in SenML unit `unit` → the stored unit of `quantity` (K → °C; the others unchanged).
 * Returns undefined when the unit is not accepted for the quantity (or missing). No range check.
 */
export function toStoredValue(quantity: Quantity, value: number, unit: string | undefined): number | undefined {
  if (!isAcceptedUnit(quantity, unit)) return undefined;
  return unit === "K" ? kelvinToCelsius(value) : value;
}

/**
 * A stored value in display units rounded as it is shown (displayDecimals: one decimal for
 * temperatures, whole percent for the rest); same rounding as formatQuantity, never −0.
 */
export function roundForDisplay(quantity: Quantity, valueSi: number, unit: TemperatureUnit): number {
  const rounded = Number(toDisplayValue(quantity, valueSi, unit).toFixed(displayDecimals(quantity)));
  return rounded === 0 ? 0 : rounded;
}
