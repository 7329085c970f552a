import type { Quantity, SensorKind, WindowedQuantity } from "../schemas/quantities.js";

/**
 * A probe's two-point (linear) correction, in stored units: calibrated = gain × measured + offset.
 * Capacitance moisture probes need a substrate-specific linear calibration to m³/m³ (Rhie & Kim
 * 2017, HortScience 52(1):162); temperature and RH probes usually need an offset only.
 */
export interface Calibration {
  offset: number;
  gain: number;
}

export const IDENTITY_CALIBRATION: Readonly<Calibration> = Object.freeze({ offset: 0, gain: 1 });

/** Per quantity; a quantity not listed is read as measured. */
export type SensorCalibration = Partial<Record<WindowedQuantity, Calibration>>;

/** The windowed quantities each kind of probe reports (PRODUCT.md §3). */
export const KIND_WINDOWED_QUANTITIES: Record<SensorKind, readonly WindowedQuantity[]> = {
  air: ["air.temperature", "air.humidity"],
  medium: ["medium.temperature", "medium.moisture"],
  combined: ["air.temperature", "air.humidity", "medium.temperature", "medium.moisture"],
};

/**
 * Largest offset an admin may set per quantity, in stored units: beyond these the probe is
 * faulty, not out of calibration (common practice: a field check against a reference
 * thermometer or hygrometer finds tenths to a few units).
 */
export const MAX_CALIBRATION_OFFSET: Record<WindowedQuantity, number> = {
  "air.temperature": 5,
  "air.humidity": 15,
  "medium.temperature": 5,
  "medium.moisture": 0.2,
};

/** Gains outside this range mean a wrong substrate curve rather than a calibration (common practice). */
export const CALIBRATION_GAIN_RANGE = { min: 0.5, max: 2 } as const;

export function isIdentity(c: Calibration | undefined): boolean {
  return c === undefined || (c.offset === 0 && c.gain === 1);
}

/** The calibrated value; quantities without a calibration (and the battery) pass through. */
export function calibrate(quantity: Quantity, measured: number, calibration: SensorCalibration | undefined): number {
  const c = quantity === "battery" ? undefined : calibration?.[quantity];
  if (!c) return measured;
  return c.gain * measured + c.offset;
}
