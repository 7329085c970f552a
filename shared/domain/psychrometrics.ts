/**
 * Psychrometrics for one air reading (temperature in °C, relative humidity in %).
 *
 * Saturation vapour pressure after FAO-56 eq. 11 (Allen et al. 1998), VPD after FAO-56 eqs. 10–11,
 * dew point by the Magnus form with the Alduchov & Eskridge (1996) coefficients.
 * Every function refuses inputs outside its domain by returning `undefined`, never NaN.
 */

/** Temperatures these functions accept, °C (covers the probes' −40…85 °C range). */
export const PSYCHROMETRIC_TEMPERATURE_RANGE_C = { min: -40, max: 85 } as const;

/** Alduchov & Eskridge (1996) Magnus coefficients over water: b = 17.625, c = 243.04 °C. */
export const MAGNUS_B = 17.625;
export const MAGNUS_C_C = 243.04;

/** An air–dew-point margin below which condensation is likely, °C (1–2 °C is common practice). */
export const DEFAULT_CONDENSATION_MARGIN_C = 2;

function isTemperatureOk(tC: number): boolean {
  return Number.isFinite(tC) && tC >= PSYCHROMETRIC_TEMPERATURE_RANGE_C.min && tC <= PSYCHROMETRIC_TEMPERATURE_RANGE_C.max;
}

/**
 * Saturation vapour pressure e°(T) in kPa, FAO-56 eq. 11: 0.6108 · exp(17.27 T / (T + 237.3)).
 * T in °C; undefined outside PSYCHROMETRIC_TEMPERATURE_RANGE_C or non-finite.
 */
export function saturationVapourPressureKPa(tC: number): number | undefined {
  if (!isTemperatureOk(tC)) return undefined;
  return 0.6108 * Math.exp((17.27 * tC) / (tC + 237.3));
}

/**
 * Mean saturation vapour pressure of a day in kPa, FAO-56 eq. 12: (e°(Tmax) + e°(Tmin)) / 2.
 * Undefined when either temperature is refused or Tmax < Tmin.
 */
export function meanSaturationVapourPressureKPa(tMaxC: number, tMinC: number): number | undefined {
  if (!(tMaxC >= tMinC)) return undefined;
  const high = saturationVapourPressureKPa(tMaxC);
  const low = saturationVapourPressureKPa(tMinC);
  if (high === undefined || low === undefined) return undefined;
  return (high + low) / 2;
}

/**
 * Actual vapour pressure ea in kPa from one reading, FAO-56 eq. 10 rearranged: e°(T) · RH / 100.
 * RH in % from 0 to 100 inclusive (0 is dry air, ea = 0); outside, or a refused T → undefined.
 */
export function actualVapourPressureKPa(tC: number, rhPct: number): number | undefined {
  if (!(rhPct >= 0 && rhPct <= 100)) return undefined;
  const es = saturationVapourPressureKPa(tC);
  return es === undefined ? undefined : (es * rhPct) / 100;
}

/**
 * Vapour-pressure deficit in kPa from one reading: e°(T) · (1 − RH/100) (FAO-56 eqs. 10–11).
 * Always ≥ 0 and exactly 0 at 100 %RH. RH 0…100 inclusive; outside → undefined.
 */
export function vapourPressureDeficitKPa(tC: number, rhPct: number): number | undefined {
  if (!(rhPct >= 0 && rhPct <= 100)) return undefined;
  const es = saturationVapourPressureKPa(tC);
  return es === undefined ? undefined : es * (1 - rhPct / 100);
}

/**
 * Dew point in °C, Magnus form with Alduchov & Eskridge (1996) coefficients:
 * γ = ln(RH/100) + b·T/(c + T); Td = c·γ / (b − γ). T in °C, RH in %, 0 < RH ≤ 100.
 * RH 0 (no dew point exists) or above 100, or a refused T → undefined. The result is capped
 * at T, so rounding never puts the dew point above the air temperature.
 */
export function dewPointC(tC: number, rhPct: number): number | undefined {
  if (!isTemperatureOk(tC) || !(rhPct > 0 && rhPct <= 100)) return undefined;
  const gamma = Math.log(rhPct / 100) + (MAGNUS_B * tC) / (MAGNUS_C_C + tC);
  const tdC = (MAGNUS_C_C * gamma) / (MAGNUS_B - gamma);
  return Math.min(tdC, tC);
}

/**
 * Relative humidity in % from air temperature and dew point (both °C), the exact inverse of
 * {@link dewPointC}: RH = 100 · exp(b·Td/(c + Td) − b·T/(c + T)). Undefined when Td > T or either
 * temperature is refused.
 */
export function relativeHumidityFromDewPointPct(tC: number, dewPointTC: number): number | undefined {
  if (!isTemperatureOk(tC) || !Number.isFinite(dewPointTC) || dewPointTC > tC || dewPointTC <= -MAGNUS_C_C) return undefined;
  const rhPct = 100 * Math.exp((MAGNUS_B * dewPointTC) / (MAGNUS_C_C + dewPointTC) - (MAGNUS_B * tC) / (MAGNUS_C_C + tC));
  return Math.min(rhPct, 100);
}

/** Air temperature minus dew point, °C (≥ 0). Undefined where dewPointC is. */
export function dewPointMarginC(tC: number, rhPct: number): number | undefined {
  const tdC = dewPointC(tC, rhPct);
  return tdC === undefined ? undefined : tC - tdC;
}

/**
 * Condensation risk: the air is within `marginC` (default 2 °C, common practice) of its dew point,
 * so cooler surfaces (glazing, leaves at night) may be wet. Undefined where dewPointC is.
 */
export function isCondensationRisk(tC: number, rhPct: number, marginC: number = DEFAULT_CONDENSATION_MARGIN_C): boolean | undefined {
  const margin = dewPointMarginC(tC, rhPct);
  return margin === undefined ? undefined : margin <= marginC;
}
