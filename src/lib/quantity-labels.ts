import { OUT_OF_WINDOW_WORDS, QUANTITY_LABELS, describeAlert } from "../../shared/domain/quantity-words.js";
import type { Quantity, WindowedQuantity } from "../../shared/schemas/quantities.js";
import type { WindowStatus } from "../../shared/schemas/windows.js";

/*
 * The words for quantities and their statuses. The full names and the out-of-window words come
 * from shared/domain/quantity-words.ts, which the e-mails use too, so a screen and a mail never
 * call the same thing by two names. Only what is screen-specific (short tile names, the in-window
 * and no-reading words) is defined here.
 */
export { OUT_OF_WINDOW_WORDS, QUANTITY_LABELS, describeAlert };

/** Shorter names for the dashboard's tiles, where the full name would wrap. */
export const QUANTITY_SHORT_LABELS: Record<WindowedQuantity, string> = {
  "air.temperature": "Air temp",
  "air.humidity": QUANTITY_LABELS["air.humidity"],
  "medium.temperature": "Medium temp",
  "medium.moisture": QUANTITY_LABELS["medium.moisture"],
};

type OutOfWindow = Exclude<WindowStatus, "inside" | "unknown">;

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
