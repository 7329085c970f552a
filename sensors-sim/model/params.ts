/**
 * Default parameters of the simulated greenhouse.
 *
 * The targets are common practice for rooting subtropical fruit-tree cuttings (see
 * REFERENCES.md §6–7), not a published source: air 21–27 °C (70–80 °F), medium 21–25 °C,
 * medium moisture 0.35–0.55 m³/m³. With these defaults a normal bench stays inside that
 * window day and night. The physical constants (time constants, heater and heat-mat power)
 * are invented, chosen so a greenhouse behaves plausibly: a failed heater loses a couple of
 * degrees within half an hour on a cold night, the medium follows the air over hours.
 */

/** The simulated outside climate: a cool propagation season (late winter, spring). */
export interface WeatherParams {
  /** Mean outside temperature, °C. */
  meanC: number;
  /** Half the day/night swing, °C; warmest at `warmestHour`. */
  diurnalAmplitudeC: number;
  warmestHour: number;
  /** Weather drift (fronts): an Ornstein–Uhlenbeck process around 0. */
  driftSigmaC: number;
  driftTauH: number;
  /** How far the outside dew point sits below the mean temperature, °C. */
  dewPointDepressionC: number;
  /** Mean cloud cover 0–1, and its drift. */
  cloudMean: number;
  cloudSigma: number;
  cloudTauH: number;
  sunriseHour: number;
  sunsetHour: number;
}

export const DEFAULT_WEATHER: WeatherParams = {
  meanC: 7,
  diurnalAmplitudeC: 5,
  warmestHour: 15,
  driftSigmaC: 2.5,
  driftTauH: 36,
  dewPointDepressionC: 4,
  cloudMean: 0.45,
  cloudSigma: 0.25,
  cloudTauH: 8,
  sunriseHour: 6.5,
  sunsetHour: 18.5,
};

/** One heated bench and the house air around it. */
export interface BenchParams {
  // Air
  /** Heater thermostat: on below setpoint − deadBand/2, off above setpoint + deadBand/2. */
  airSetpointC: number;
  airDeadBandC: number;
  /** Heating rate of the air with the heater running, °C/h. */
  heaterRateCPerH: number;
  /** Time constant of heat loss through the glazing to outside, h. */
  lossTauH: number;
  /** Extra air exchange with the vent fully open: time constant, h. */
  ventTauH: number;
  /** Vent opening: shut below ventOpenStartC, fully open at ventOpenFullC (proportional). */
  ventOpenStartC: number;
  ventOpenFullC: number;
  /** Opening of a vent that is stuck open (0–1). */
  ventStuckOpening: number;
  /** Solar gain at full sun, clear sky, °C/h. */
  solarRateCPerH: number;
  /** Random mixing of the house air (OU), °C. */
  airJitterC: number;

  // Humidity
  /** Evaporation and transpiration from benches and crop: rate toward saturation, 1/h. */
  evaporationPerH: number;
  /** Fog/mist humidistat: on below fogOnRh, off above fogOffRh (%RH); adds vapour, kPa/h. */
  fogOnRh: number;
  fogOffRh: number;
  fogRateKpaPerH: number;
  /** Extra evaporation right after watering (multiplier of evaporationPerH), decaying. */
  wetBoostAfterWatering: number;
  wetBoostTauH: number;

  // Medium
  /** Time constant of the medium following the air (deep pots of wet peat–perlite), h. */
  mediumTauH: number;
  /** Heat mat thermostat (probe in the medium) and its heating rate, °C/h. */
  matSetpointC: number;
  matDeadBandC: number;
  matRateCPerH: number;
  /** The bench loses heat downward to the ground under the house: temperature, °C, and time constant, h. */
  groundC: number;
  floorTauH: number;
  /** Evaporative cooling of the medium, °C/h per (kPa of air VPD × m³/m³ of moisture). */
  evaporativeCoolingCoeff: number;
  /** Temperature of the (tempered) watering water, °C; colder water cools the medium. */
  waterC: number;
  /** Heat capacity of the medium's solids, as an equivalent volume fraction of water. */
  solidsWaterEquivalent: number;

  // Moisture (volumetric water content, m³/m³)
  /** Water held after free drainage (container capacity). */
  containerCapacity: number;
  /** Saturation (total porosity): nothing holds more. */
  saturation: number;
  /** Residual water the medium does not give up. */
  residual: number;
  /** Drying rate toward residual at the reference VPD, 1/h. */
  dryingPerH: number;
  referenceVpdKpa: number;
  /** Drainage of water above container capacity: time constant, h. */
  drainTauH: number;
  /** The grower's watering: at each hour, water when below `below`, up to `target`. */
  watering: ReadonlyArray<{ hour: number; below: number }>;
  wateringTarget: number;
  /** Inflow from a running irrigation line when over-watering, m³/m³ per h. */
  overWaterInflowPerH: number;
  /** Drainage slowed by this factor when pots stand in water (over-watering). */
  overWaterDrainSlowdown: number;
}

export const DEFAULT_BENCH: BenchParams = {
  // Common practice: aim the heater at the middle of the 21–27 °C window.
  airSetpointC: 23,
  airDeadBandC: 1.5,
  heaterRateCPerH: 12,
  lossTauH: 3,
  ventTauH: 0.4,
  ventOpenStartC: 25,
  ventOpenFullC: 26.5,
  ventStuckOpening: 0.6,
  solarRateCPerH: 8,
  airJitterC: 0.1,

  // Tuned so a normal night and the morning watering keep the air inside the "Warm rooting"
  // window (65–85 % RH) the demo starts from: over 14 simulated days × 36 benches no humid spell
  // outlasts its 30-minute hold-off (an invented constant, like the rest of this block).
  evaporationPerH: 0.5,
  // Common practice for cuttings under fog: keep the air humid, but short of condensation.
  fogOnRh: 72,
  fogOffRh: 80,
  fogRateKpaPerH: 4,
  wetBoostAfterWatering: 0.7,
  wetBoostTauH: 1.5,

  mediumTauH: 2,
  // Common practice: bottom heat keeps the medium at 21–25 °C, a little above the night air.
  matSetpointC: 23,
  matDeadBandC: 1,
  matRateCPerH: 5,
  groundC: 12,
  floorTauH: 6,
  evaporativeCoolingCoeff: 5,
  waterC: 18,
  solidsWaterEquivalent: 0.25,

  // Container capacity of a peat–perlite mix: 0.45–0.65 by volume is the usual range
  // (REFERENCES.md §7); the target band 0.35–0.55 is common practice.
  containerCapacity: 0.5,
  saturation: 0.72,
  residual: 0.08,
  dryingPerH: 0.011,
  referenceVpdKpa: 0.6,
  drainTauH: 0.3,
  watering: [
    { hour: 8, below: 0.48 },
    { hour: 13.5, below: 0.43 },
    { hour: 19, below: 0.41 },
  ],
  wateringTarget: 0.53,
  overWaterInflowPerH: 0.08,
  overWaterDrainSlowdown: 40,
};

/** A probe's measuring behaviour. */
export interface ProbeParams {
  /** Standard deviation of the reading noise, per quantity. */
  noise: { airC: number; rh: number; mediumC: number; moisture: number };
  /** Standard deviation of the fixed calibration bias each probe is built with. */
  bias: { airC: number; rh: number; mediumC: number; moisture: number };
  /** Resolution of the reported value. */
  step: { airC: number; rh: number; mediumC: number; moisture: number };
  /** Probability that one sample is lost (a failed read or a lost radio frame). */
  dropoutRate: number;
  /** Battery: starting charge range and the drain per simulated day, %EL. */
  batteryStart: [number, number];
  batteryDrainPerDay: number;
}

export const DEFAULT_PROBE: ProbeParams = {
  noise: { airC: 0.08, rh: 0.8, mediumC: 0.05, moisture: 0.003 },
  bias: { airC: 0.15, rh: 1.5, mediumC: 0.1, moisture: 0.006 },
  step: { airC: 0.1, rh: 1, mediumC: 0.1, moisture: 0.001 },
  dropoutRate: 0.002,
  batteryStart: [60, 100],
  batteryDrainPerDay: 0.4,
};

/**
 * What a probe can physically report; a real sensor saturates at its limits. The server's
 * physical-range checks are its own; these are deliberately the wider device limits.
 */
export const PROBE_RANGE = {
  "air.temperature": [-40, 85],
  "air.humidity": [0, 100],
  "medium.temperature": [-20, 60],
  "medium.moisture": [0, 1],
  battery: [0, 100],
} as const;

/** Fixed model step, simulated seconds. Fixed, so that a seed reproduces a run exactly. */
export const MODEL_STEP_S = 15;
