import type { Quantity, WindowedQuantity } from "../../shared/schemas/quantities.js";
import type { WindowStatus } from "../../shared/schemas/windows.js";

/** What a grower calls each quantity, in the order cards and charts show them. */
export const QUANTITY_LABELS: Record<WindowedQuantity, string> = {
  "air.temperature": "Air temperature",
  "air.humidity": "Air humidity",
  "medium.temperature": "Medium temperature",
  "medium.moisture": "Medium moisture",
};

/** Shorter names for the dashboard's tiles, where the full name would wrap. */
export const QUANTITY_SHORT_LABELS: Record<WindowedQuantity, string> = {
  "air.temperature": "Air temp",
  "air.humidity": "Air humidity",
  "medium.temperature": "Medium temp",
  "medium.moisture": "Medium moisture",
};

type OutOfWindow = Exclude<WindowStatus, "inside" | "unknown">;

const OUT_OF_WINDOW_WORDS: Record<WindowedQuantity, Record<OutOfWindow, string>> = {
  "air.temperature": { below: "Too cold", above: "Too warm" },
  "air.humidity": { below: "Too dry", above: "Too humid" },
  "medium.temperature": { below: "Medium too cold", above: "Medium too warm" },
  "medium.moisture": { below: "Medium too dry", above: "Medium too wet" },
};

export const IN_WINDOW_WORDS = "In window";
export const NO_READING_WORDS = "No reading";
export const NO_WINDOW_WORDS = "No window set";

export function isWindowedQuantity(quantity: Quantity): quantity is WindowedQuantity {
  return quantity in QUANTITY_LABELS;
}

/**
 * The plain words for where one quantity stands. `hasValue` separates "no reading yet" from a
 * reading the server could not judge (no window configured), both of which arrive as "unknown".
 */
export function describeStatus(quantity: WindowedQuantity, status: WindowStatus, hasValue = true): string {
  if (!hasValue) return NO_READING_WORDS;
  if (status === "inside") return IN_WINDOW_WORDS;
  if (status === "unknown") return NO_WINDOW_WORDS;
  return OUT_OF_WINDOW_WORDS[quantity][status];
}

export function isOutOfWindow(status: WindowStatus): status is OutOfWindow {
  return status === "below" || status === "above";
}
