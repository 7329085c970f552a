import type { BenchParams } from "./params.js";
import { relativeHumidity, saturationVapourPressureKpa, vapourPressureDeficitKpa } from "./psychro.js";
import type { Rng } from "./random.js";
import { clamp, ou, type WeatherState } from "./weather.js";

/** What is broken on a bench right now (set by the scenario, see scenarios.ts). */
export interface BenchFaults {
  /** The house heater has tripped: the thermostat calls for heat, nothing comes. */
  heaterFailed: boolean;
  /** The vent is stuck at `ventStuckOpening`, whatever the temperature. */
  ventStuckOpen: boolean;
  /** The bench heat mat gives no heat. */
  matFailed: boolean;
  /** An irrigation line keeps running and the pots stand in water. */
  overWatering: boolean;
  /** A mis-set heater thermostat: replaces the setpoint and dead-band. */
  airSetpointC?: number;
  airDeadBandC?: number;
}

export const NO_FAULTS: Readonly<BenchFaults> = Object.freeze({
  heaterFailed: false,
  ventStuckOpen: false,
  matFailed: false,
  overWatering: false,
});

/** The true (unmeasured) state of one bench and the air around it. */
export interface BenchState {
  /** Air temperature at the bench, °C. */
  airC: number;
  /** Vapour pressure of the air, kPa. */
  vapourKpa: number;
  /** Relative humidity, %. */
  rh: number;
  /** Medium temperature in the pots, °C. */
  mediumC: number;
  /** Volumetric water content of the medium, m³/m³ (0–1). */
  moisture: number;
  heaterOn: boolean;
  matOn: boolean;
  fogOn: boolean;
  /** Vent opening, 0 (shut) – 1 (fully open). */
  vent: number;
  /** Extra evaporation after watering (decays). */
  wetBoost: number;
  /** How many times the bench has been watered. */
  waterings: number;
}

/** True when the clock passed `hour` going from prevHour to hour (handles midnight). */
export function passedHour(prevHour: number, hour: number, at: number): boolean {
  const h = ((at % 24) + 24) % 24;
  if (prevHour <= hour) return prevHour < h && h <= hour;
  return h > prevHour || h <= hour;
}

/**
 * One heated bench: house air (heater thermostat with dead-band, heat loss to outside,
 * proportional vent, sun), humidity as a vapour balance (so RH moves against temperature and
 * rises after watering), the medium lagging the air and lifted by a thermostatic heat mat,
 * moisture drying on a curve and jumping at watering. Explicit Euler on a fixed step; pure.
 */
export class BenchModel {
  state: BenchState;
  private jitter = 0;

  constructor(
    readonly params: BenchParams,
    private readonly rng: Rng,
    /** Hours after the round's start that this bench is watered (walking order). */
    private readonly wateringOffsetH = 0,
  ) {
    const p = params;
    const airC = p.airSetpointC;
    this.state = {
      airC,
      vapourKpa: 0.8 * saturationVapourPressureKpa(airC),
      rh: 80,
      mediumC: p.matSetpointC,
      moisture: rng.uniform(0.44, 0.5),
      heaterOn: false,
      matOn: false,
      fogOn: false,
      vent: 0,
      wetBoost: 0,
      waterings: 0,
    };
  }

  /** Advance by dtS seconds; prevHour/hour are the hours of day before and after the step. */
  step(dtS: number, prevHour: number, hour: number, weather: WeatherState, faults: BenchFaults): BenchState {
    const p = this.params;
    const s = this.state;
    const dtH = dtS / 3600;

    // Air: heater thermostat with a dead-band (it remembers whether it was on).
    const setpoint = faults.airSetpointC ?? p.airSetpointC;
    const deadBand = faults.airDeadBandC ?? p.airDeadBandC;
    let heaterOn = s.heaterOn;
    if (s.airC < setpoint - deadBand / 2) heaterOn = true;
    else if (s.airC > setpoint + deadBand / 2) heaterOn = false;
    const heating = heaterOn && !faults.heaterFailed;

    const vent = faults.ventStuckOpen
      ? p.ventStuckOpening
      : clamp((s.airC - p.ventOpenStartC) / (p.ventOpenFullC - p.ventOpenStartC), 0, 1);
    const exchangePerH = 1 / p.lossTauH + vent / p.ventTauH;

    const airCore = s.airC - this.jitter;
    const dAir =
      (weather.outsideC - airCore) * exchangePerH +
      (heating ? p.heaterRateCPerH : 0) +
      weather.sun * p.solarRateCPerH;
    this.jitter = ou(this.jitter, p.airJitterC, 0.2, dtH, this.rng);
    const airC = airCore + dAir * dtH + this.jitter;

    // Humidity: exchange with outside air, evaporation from crop and medium, fog.
    const eSat = saturationVapourPressureKpa(airC);
    const wetness = 0.5 + (0.5 * s.moisture) / 0.45;
    const evaporationPerH = p.evaporationPerH * wetness * (1 + s.wetBoost);
    let fogOn = s.fogOn;
    if (s.rh < p.fogOnRh) fogOn = true;
    else if (s.rh > p.fogOffRh) fogOn = false;
    const dVapour =
      (weather.outsideVapourKpa - s.vapourKpa) * exchangePerH +
      evaporationPerH * Math.max(0, eSat - s.vapourKpa) +
      (fogOn ? p.fogRateKpaPerH : 0);
    // Air cannot hold more than saturation: the rest condenses on the glazing and leaves.
    const vapourKpa = clamp(s.vapourKpa + dVapour * dtH, 0.05, eSat);
    const vpd = vapourPressureDeficitKpa(airC, vapourKpa);

    // Medium: follows the air, loses heat to the ground, lifted by the heat mat, cooled by evaporation.
    let matOn = s.matOn;
    if (s.mediumC < p.matSetpointC - p.matDeadBandC / 2) matOn = true;
    else if (s.mediumC > p.matSetpointC + p.matDeadBandC / 2) matOn = false;
    const matHeating = matOn && !faults.matFailed;
    const dMedium =
      (airC - s.mediumC) / p.mediumTauH +
      (p.groundC - s.mediumC) / p.floorTauH +
      (matHeating ? p.matRateCPerH : 0) -
      p.evaporativeCoolingCoeff * vpd * s.moisture;
    let mediumC = s.mediumC + dMedium * dtH;

    // Moisture: drying toward residual on a curve (faster in dry, warm air), drainage above
    // container capacity, a running irrigation line when over-watered.
    const drainTauH = faults.overWatering ? p.drainTauH * p.overWaterDrainSlowdown : p.drainTauH;
    const drain = s.moisture > p.containerCapacity ? (s.moisture - p.containerCapacity) / drainTauH : 0;
    const dryFactor = Math.max(0.1, 0.4 + (0.6 * vpd) / p.referenceVpdKpa) * Math.max(0.5, 1 + 0.03 * (s.mediumC - 23));
    const dry = p.dryingPerH * dryFactor * (s.moisture - p.residual);
    const inflow = faults.overWatering ? p.overWaterInflowPerH : 0;
    let moisture = clamp(s.moisture + (inflow - drain - dry) * dtH, p.residual, p.saturation);
    if (inflow > 0) mediumC -= ((mediumC - p.waterC) * inflow * dtH) / (moisture + p.solidsWaterEquivalent);

    let wetBoost = s.wetBoost * Math.exp(-dtH / p.wetBoostTauH);
    // Pots standing in water and a wet bench top keep evaporating: the air turns humid.
    if (faults.overWatering) wetBoost = Math.max(wetBoost, 1.5 * p.wetBoostAfterWatering);
    let waterings = s.waterings;
    for (const round of p.watering) {
      if (!passedHour(prevHour, hour, round.hour + this.wateringOffsetH)) continue;
      if (moisture >= round.below) continue;
      const added = p.wateringTarget - moisture;
      // Mixing with colder water cools the medium (REFERENCES.md §6: cold water delays rooting).
      mediumC -= ((mediumC - p.waterC) * added) / (p.wateringTarget + p.solidsWaterEquivalent);
      moisture = p.wateringTarget;
      wetBoost = Math.min(2, wetBoost + p.wetBoostAfterWatering);
      waterings += 1;
    }

    this.state = {
      airC,
      vapourKpa,
      rh: relativeHumidity(airC, vapourKpa),
      mediumC,
      moisture,
      heaterOn,
      matOn,
      fogOn,
      vent,
      wetBoost,
      waterings,
    };
    return this.state;
  }
}
