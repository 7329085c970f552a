import { z } from "zod";

/**
 * The quantities a bench probe reports, by their SenML record name (PRODUCT.md §4).
 * Values are stored in SI: °C, %RH, m³/m³ (a 0–1 ratio) and %EL.
 */
export const QUANTITIES = [
  "air.temperature",
  "air.humidity",
  "medium.temperature",
  "medium.moisture",
  "battery",
] as const;

export const quantitySchema = z.enum(QUANTITIES);
export type Quantity = z.infer<typeof quantitySchema>;

/** The quantities a rooting window governs (battery is reported, never windowed). */
export const WINDOWED_QUANTITIES = [
  "air.temperature",
  "air.humidity",
  "medium.temperature",
  "medium.moisture",
] as const satisfies readonly Quantity[];
export type WindowedQuantity = (typeof WINDOWED_QUANTITIES)[number];

/** The SenML unit each quantity is stored in (RFC 8428 §12.1). */
export const STORED_UNIT: Record<Quantity, string> = {
  "air.temperature": "Cel",
  "air.humidity": "%RH",
  "medium.temperature": "Cel",
  "medium.moisture": "/",
  battery: "%EL",
};

export const sensorKindSchema = z.enum(["air", "medium", "combined"]);
export type SensorKind = z.infer<typeof sensorKindSchema>;
