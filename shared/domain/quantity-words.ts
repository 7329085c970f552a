import type { WindowedQuantity } from "../schemas/quantities.js";

/** What a grower calls each quantity: the same words on screens and in e-mail. */
export const QUANTITY_LABELS: Record<WindowedQuantity, string> = {
  "air.temperature": "Air temperature",
  "air.humidity": "Air humidity",
  "medium.temperature": "Medium temperature",
  "medium.moisture": "Medium moisture",
};

/** Plain words for a quantity out of its window, by side. */
export const OUT_OF_WINDOW_WORDS: Record<WindowedQuantity, Record<"below" | "above", string>> = {
  "air.temperature": { below: "Too cold", above: "Too warm" },
  "air.humidity": { below: "Too dry", above: "Too humid" },
  "medium.temperature": { below: "Medium too cold", above: "Medium too warm" },
  "medium.moisture": { below: "Medium too dry", above: "Medium too wet" },
};

/** A one-line summary of an alert, e.g. "Air too cold", "Condensation risk", "Sensor h1-b1-air silent". */
export function describeAlert(alert: { kind: string; quantity: string | null; direction: "below" | "above" | null; sensorId: string | null }): string {
  if (alert.kind === "condensation") return "Condensation risk";
  if (alert.kind === "sensor-silent") return `Sensor ${alert.sensorId ?? ""} silent`.replace("  ", " ");
  const words = alert.quantity && alert.direction ? OUT_OF_WINDOW_WORDS[alert.quantity as WindowedQuantity]?.[alert.direction] : undefined;
  if (!words) return "Out of window";
  // "Too cold" reads as air on a card; in a list or a mail say which.
  return words.startsWith("Medium") ? words : `Air ${words.toLowerCase()}`;
}
