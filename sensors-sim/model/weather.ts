import type { WeatherParams } from "./params.js";
import { saturationVapourPressureKpa } from "./psychro.js";
import type { Rng } from "./random.js";

/** The outside climate at one moment. */
export interface WeatherState {
  /** Outside air temperature, °C. */
  outsideC: number;
  /** Outside vapour pressure, kPa. */
  outsideVapourKpa: number;
  /** Cloud cover, 0 (clear) – 1 (overcast). */
  cloud: number;
  /** Sunshine reaching the glazing, 0 (night) – 1 (clear noon). */
  sun: number;
}

/** Hour of day (0 ≤ h < 24) of simulated time `simS`, given the hour the run started at. */
export function hourOfDay(startHour: number, simS: number): number {
  const h = (startHour + simS / 3600) % 24;
  return h < 0 ? h + 24 : h;
}

/** Seconds from the start until the next time the clock shows `hour` (0 if it shows it now). */
export function secondsUntilHour(startHour: number, hour: number): number {
  const d = (((hour - startHour) % 24) + 24) % 24;
  return d * 3600;
}

/** The sun's strength by hour of day, without clouds: a half sine from sunrise to sunset. */
export function clearSkySun(hour: number, p: Pick<WeatherParams, "sunriseHour" | "sunsetHour">): number {
  if (hour <= p.sunriseHour || hour >= p.sunsetHour) return 0;
  return Math.sin((Math.PI * (hour - p.sunriseHour)) / (p.sunsetHour - p.sunriseHour));
}

/**
 * Outside weather: a diurnal cosine around a mean, plus a slow random drift (weather fronts),
 * plus drifting cloud cover. Pure: all randomness comes from the injected generator.
 */
export class Weather {
  private drift = 0;
  private cloudDrift = 0;
  state: WeatherState;

  constructor(
    private readonly p: WeatherParams,
    private readonly rng: Rng,
  ) {
    this.drift = rng.normal() * p.driftSigmaC;
    this.cloudDrift = rng.normal() * p.cloudSigma;
    this.state = this.compute(0);
  }

  /** Advance by dtS seconds to a moment whose hour of day is `hour`. */
  step(dtS: number, hour: number): WeatherState {
    const dtH = dtS / 3600;
    this.drift = ou(this.drift, this.p.driftSigmaC, this.p.driftTauH, dtH, this.rng);
    this.cloudDrift = ou(this.cloudDrift, this.p.cloudSigma, this.p.cloudTauH, dtH, this.rng);
    this.state = this.compute(hour);
    return this.state;
  }

  private compute(hour: number): WeatherState {
    const p = this.p;
    const diurnal = p.diurnalAmplitudeC * Math.cos((2 * Math.PI * (hour - p.warmestHour)) / 24);
    const outsideC = clamp(p.meanC + diurnal + this.drift, -25, 35);
    // The dew point moves with the weather, not with the hour: humid nights, drier afternoons.
    const dewPointC = Math.min(outsideC, p.meanC + this.drift - p.dewPointDepressionC);
    const cloud = clamp(p.cloudMean + this.cloudDrift, 0, 1);
    const sun = clearSkySun(hour, p) * (1 - 0.75 * cloud);
    return { outsideC, outsideVapourKpa: saturationVapourPressureKpa(dewPointC), cloud, sun };
  }
}

/** One exact step of an Ornstein–Uhlenbeck process with stationary deviation sigma. */
export function ou(x: number, sigma: number, tauH: number, dtH: number, rng: Rng): number {
  const a = Math.exp(-dtH / tauH);
  return x * a + sigma * Math.sqrt(1 - a * a) * rng.normal();
}

export function clamp(x: number, min: number, max: number): number {
  return x < min ? min : x > max ? max : x;
}
