import {
  celsiusDeltaToFahrenheit,
  displayUnit,
  fahrenheitDeltaToCelsius,
  fromDisplayValue,
  isTemperature,
  toDisplayValue,
  type TemperatureUnit,
} from "../../../../shared/domain/units.js";
import { WINDOWED_QUANTITIES, type WindowedQuantity } from "../../../../shared/schemas/quantities.js";
import type { QuantityWindow, WindowLimitField } from "../../../../shared/schemas/windows.js";

/*
 * Window values between what a person types (their unit: °F or °C, % RH, % VWC, minutes) and what
 * travels (SI: °C, % RH, ratio 0–1, seconds). Limits convert with toDisplayValue/fromDisplayValue;
 * the clearing band and the dew-point margin are temperature DIFFERENCES and convert without the
 * 32° offset (celsiusDeltaToFahrenheit / fahrenheitDeltaToCelsius).
 */

export const LIMIT_FIELDS = ["min", "max", "delayS", "hysteresis"] as const satisfies readonly WindowLimitField[];

export const FIELD_LABELS: Record<WindowLimitField | "dewPointMarginC", string> = {
  min: "Minimum",
  max: "Maximum",
  delayS: "Hold-off delay",
  hysteresis: "Clearing band",
  dewPointMarginC: "Dew-point margin",
};

/** The unit shown beside a field: "°F", "% RH", "% VWC", "min". */
export function fieldUnit(quantity: WindowedQuantity, field: WindowLimitField, unit: TemperatureUnit): string {
  return field === "delayS" ? "min" : displayUnit(quantity, unit);
}

/** A stored value → the number shown in the field. */
export function toFieldDisplay(quantity: WindowedQuantity, field: WindowLimitField, valueSi: number, unit: TemperatureUnit): number {
  if (field === "delayS") return valueSi / 60;
  if (field === "hysteresis") {
    if (isTemperature(quantity)) return unit === "F" ? celsiusDeltaToFahrenheit(valueSi) : valueSi;
    return quantity === "medium.moisture" ? valueSi * 100 : valueSi;
  }
  return toDisplayValue(quantity, valueSi, unit);
}

/** A typed number → the stored value. Delays become whole seconds (the schema's unit). */
export function fromFieldDisplay(quantity: WindowedQuantity, field: WindowLimitField, shown: number, unit: TemperatureUnit): number {
  if (!Number.isFinite(shown)) return shown;
  if (field === "delayS") return Math.round(shown * 60);
  if (field === "hysteresis") {
    if (isTemperature(quantity)) return unit === "F" ? fahrenheitDeltaToCelsius(shown) : shown;
    return quantity === "medium.moisture" ? shown / 100 : shown;
  }
  return fromDisplayValue(quantity, shown, unit);
}

export function marginToDisplay(marginC: number, unit: TemperatureUnit): number {
  return unit === "F" ? celsiusDeltaToFahrenheit(marginC) : marginC;
}

export function marginFromDisplay(shown: number, unit: TemperatureUnit): number {
  if (!Number.isFinite(shown)) return shown;
  return unit === "F" ? fahrenheitDeltaToCelsius(shown) : shown;
}

/** A number as typed into a field: at most `decimals` places, no trailing zeros, never "-0". */
export function formatNumber(value: number, decimals: number): string {
  const text = String(Number(value.toFixed(decimals)));
  return text === "-0" ? "0" : text;
}

/** Decimals a field shows: temperatures 1, temperature bands 2 (0.5 °C = 0.9 °F), the rest 1; delays 2 (minutes). */
function fieldDecimals(quantity: WindowedQuantity, field: WindowLimitField): number {
  if (field === "delayS" || (field === "hysteresis" && isTemperature(quantity))) return 2;
  return 1;
}

export function formatFieldInput(quantity: WindowedQuantity, field: WindowLimitField, valueSi: number, unit: TemperatureUnit): string {
  return formatNumber(toFieldDisplay(quantity, field, valueSi, unit), fieldDecimals(quantity, field));
}

export function formatMarginInput(marginC: number, unit: TemperatureUnit): string {
  return formatNumber(marginToDisplay(marginC, unit), 2);
}

/** A stored value in words for read-only views: "69.8 °F", "10 min", "0.9 °F", "2 % VWC". */
export function formatFieldValue(quantity: WindowedQuantity, field: WindowLimitField, valueSi: number, unit: TemperatureUnit): string {
  if (field === "delayS") return formatDelay(valueSi);
  // Temperature limits with one decimal always, as on the dashboard ("64.0 °F", "69.8 °F").
  const shown =
    isTemperature(quantity) && field !== "hysteresis"
      ? toFieldDisplay(quantity, field, valueSi, unit).toFixed(1).replace(/^-0\.0$/, "0.0")
      : formatFieldInput(quantity, field, valueSi, unit);
  return `${shown} ${fieldUnit(quantity, field, unit)}`;
}

export function formatMargin(marginC: number, unit: TemperatureUnit): string {
  return `${formatMarginInput(marginC, unit)} ${unit === "F" ? "°F" : "°C"}`;
}

/** Seconds in words: "10 min", "1 h 30 min", "45 s", "none". */
export function formatDelay(seconds: number): string {
  if (seconds <= 0) return "none";
  if (seconds < 60) return `${seconds} s`;
  const minutes = seconds / 60;
  if (minutes < 60) return `${formatNumber(minutes, 1)} min`;
  const hours = Math.floor(minutes / 60);
  const rest = Math.round(minutes - hours * 60);
  return rest === 0 ? `${hours} h` : `${hours} h ${rest} min`;
}

/** "72.5", " 72,5 " → 72.5; empty or not a number → NaN (the shared schema then says "Enter a number"). */
export function parseDecimal(text: string): number {
  const trimmed = text.trim().replace(",", ".");
  if (trimmed === "" || !/^[-+]?(\d+\.?\d*|\.\d+)$/.test(trimmed)) return Number.NaN;
  return Number(trimmed);
}

// ── drafts: what the form holds ─────────────────────────────────────────────

/**
 * One field as typed. `initialText`/`initialSi` remember what was loaded, so a field left alone
 * sends the stored value exactly (21 °C shown as 69.8 °F would otherwise come back as 20.99 °C
 * and be recorded as a change).
 */
export type FieldDraft = { text: string; initialText: string; initialSi: number | null };

export type QuantityDraft = { quantity: WindowedQuantity; isOn: boolean; fields: Record<WindowLimitField, FieldDraft> };

export type WindowSetDraft = { quantities: QuantityDraft[]; margin: FieldDraft };

function fieldDraft(text: string, si: number | null): FieldDraft {
  return { text, initialText: text, initialSi: si };
}

/** The draft of a window, or of an empty one (fields blank) when there is none. */
export function quantityDraft(quantity: WindowedQuantity, window: QuantityWindow | undefined | null, unit: TemperatureUnit, isOn = window != null): QuantityDraft {
  const fields = Object.fromEntries(
    LIMIT_FIELDS.map((f) => [f, window ? fieldDraft(formatFieldInput(quantity, f, window[f], unit), window[f]) : fieldDraft("", null)]),
  ) as Record<WindowLimitField, FieldDraft>;
  return { quantity, isOn, fields };
}

/** A draft of a whole set, in WINDOWED_QUANTITIES order; quantities without a window start off. */
export function windowSetDraft(windows: readonly QuantityWindow[], marginC: number | null, unit: TemperatureUnit): WindowSetDraft {
  return {
    quantities: WINDOWED_QUANTITIES.map((q) => quantityDraft(q, windows.find((w) => w.quantity === q), unit)),
    margin: marginC === null ? fieldDraft("", null) : fieldDraft(formatMarginInput(marginC, unit), marginC),
  };
}

/** Replaces a field's text (a keystroke). */
export function withFieldText(draft: FieldDraft, text: string): FieldDraft {
  return { ...draft, text };
}

/** A field's stored value: the loaded one while the text is untouched, else the typed number converted. */
export function fieldSi(quantity: WindowedQuantity, field: WindowLimitField, draft: FieldDraft, unit: TemperatureUnit): number {
  if (draft.initialSi !== null && draft.text.trim() === draft.initialText) return draft.initialSi;
  return fromFieldDisplay(quantity, field, parseDecimal(draft.text), unit);
}

export function marginSi(draft: FieldDraft, unit: TemperatureUnit): number {
  if (draft.initialSi !== null && draft.text.trim() === draft.initialText) return draft.initialSi;
  return marginFromDisplay(parseDecimal(draft.text), unit);
}

/** The window a quantity's draft stands for, in SI (numbers may be NaN: the schema says so). */
export function draftWindow(draft: QuantityDraft, unit: TemperatureUnit): QuantityWindow {
  const q = draft.quantity;
  return {
    quantity: q,
    min: fieldSi(q, "min", draft.fields.min, unit),
    max: fieldSi(q, "max", draft.fields.max, unit),
    delayS: fieldSi(q, "delayS", draft.fields.delayS, unit),
    hysteresis: fieldSi(q, "hysteresis", draft.fields.hysteresis, unit),
  };
}

/** The windows of the quantities switched on, in order (the order field errors are numbered by). */
export function draftWindows(draft: WindowSetDraft, unit: TemperatureUnit): QuantityWindow[] {
  return draft.quantities.filter((q) => q.isOn).map((q) => draftWindow(q, unit));
}

/** The key of a field in the form's error map: "air.temperature.min", or "dewPointMarginC". */
export function fieldKey(quantity: WindowedQuantity, field: WindowLimitField): string {
  return `${quantity}.${field}`;
}

/**
 * Issues of the shared schema or the server (paths like "windows.0.min") moved onto the form's
 * fields, given the quantities in the order they were sent. Anything else is the form's message.
 */
export function placeWindowIssues(
  issues: readonly { path: string; message: string }[],
  sentQuantities: readonly WindowedQuantity[],
): { fields: Record<string, string>; form: string | null } {
  const fields: Record<string, string> = {};
  let form: string | null = null;
  for (const issue of issues) {
    const parts = issue.path.split(".");
    if (parts[0] === "dewPointMarginC") {
      fields.dewPointMarginC ??= issue.message;
      continue;
    }
    if (parts[0] === "windows" && parts.length >= 3) {
      const quantity = sentQuantities[Number(parts[1])];
      const field = parts[2] as WindowLimitField;
      if (quantity && (LIMIT_FIELDS as readonly string[]).includes(field)) {
        fields[fieldKey(quantity, field)] ??= issue.message;
        continue;
      }
    }
    form ??= issue.message;
  }
  return { fields, form };
}

/** zod issues as { path, message } with dotted paths, like the server's problem details. */
export function zodIssues(error: { issues: readonly { path: readonly PropertyKey[]; message: string }[] }) {
  return error.issues.map((i) => ({ path: i.path.map(String).join("."), message: i.message }));
}

/** Fields of a bench's own window whose values differ from the zone's (SI, compared with a tolerance for float noise). */
export function differingFields(own: QuantityWindow, zone: QuantityWindow | null | undefined): WindowLimitField[] {
  if (!zone) return [...LIMIT_FIELDS];
  return LIMIT_FIELDS.filter((f) => !(Number.isFinite(own[f]) && Math.abs(own[f] - zone[f]) < 1e-9));
}
