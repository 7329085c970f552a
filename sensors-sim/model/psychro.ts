/**
 * The little psychrometry the simulator needs, on top of the shared, source-checked functions
 * (FAO-56 eq. 10–11) so the simulator and the server agree on the physics.
 */
import { saturationVapourPressureKPa } from "../../shared/domain/psychrometrics.js";

/** Saturation vapour pressure over water in kPa at tC °C (FAO-56, eq. 11), clamped to the probes' range. */
export function saturationVapourPressureKpa(tC: number): number {
  return saturationVapourPressureKPa(Math.min(85, Math.max(-40, tC))) ?? 0.6108;
}

/** Relative humidity in % from the actual vapour pressure (FAO-56, eq. 10), capped at 100. */
export function relativeHumidity(tC: number, vapourKpa: number): number {
  return Math.min(100, Math.max(0, (100 * vapourKpa) / saturationVapourPressureKpa(tC)));
}

/** Vapour-pressure deficit in kPa (never negative). */
export function vapourPressureDeficitKpa(tC: number, vapourKpa: number): number {
  return Math.max(0, saturationVapourPressureKpa(tC) - vapourKpa);
}
