import type { Quantity, SensorKind } from "../../shared/schemas/quantities.js";
import { BenchModel, NO_FAULTS, type BenchFaults, type BenchState } from "./bench.js";
import {
  DEFAULT_BENCH,
  DEFAULT_PROBE,
  DEFAULT_WEATHER,
  MODEL_STEP_S,
  type BenchParams,
  type ProbeParams,
  type WeatherParams,
} from "./params.js";
import { KIND_QUANTITIES, Probe, type ProbeValues } from "./probe.js";
import { createRng } from "./random.js";
import { planScenario, type ScenarioName, type ScenarioPlan, type SensorFaultSpan } from "./scenarios.js";
import { hourOfDay, Weather, type WeatherState } from "./weather.js";

export interface WorldSpec {
  seed: number;
  /** Hour of day (0–24, fractional) at simulated time 0. */
  startHour: number;
  scenario: ScenarioName;
  /** Bench ids/names or sensor ids the scenario's fault hits (empty: the scenario's default). */
  affect?: readonly string[];
  benches: ReadonlyArray<{ id: string; name: string }>;
  sensors: ReadonlyArray<{ id: string; kind: SensorKind; bench: number }>;
  /** Probability a sample is lost; default DEFAULT_PROBE.dropoutRate. */
  dropoutRate?: number;
  /** Simulated hours run before time 0, so thermostats and weather have settled. */
  warmUpH?: number;
  weather?: Partial<WeatherParams>;
  bench?: Partial<BenchParams>;
  probe?: Partial<ProbeParams>;
}

/** What one sensor produces at one sample time. */
export type SensorOutput =
  | { type: "reading"; values: ProbeValues }
  | { type: "dropout" }
  | { type: "dead" }
  /** A garbage sample: `n` counts this sensor's garbage samples; `values` is what it measured. */
  | { type: "garbage"; n: number; values: ProbeValues };

/** How long a dying sensor's battery sags before it goes silent, s. */
const DEATH_SAG_S = 20 * 60;

interface SensorSim {
  probe: Probe;
  bench: number;
  faults: SensorFaultSpan[];
  samples: number;
  garbage: number;
}

/**
 * The whole simulated site: one outside weather, the benches, the probes on them, and the
 * scenario's faults. Advanced on a fixed step (MODEL_STEP_S), so the same seed and spec give
 * the same numbers however the transport's timers jitter. No I/O.
 */
export class World {
  readonly plan: ScenarioPlan;
  readonly startHour: number;
  /** Current simulated time, s (negative during warm-up). */
  simS: number;
  private readonly weather: Weather;
  private readonly benches: BenchModel[];
  private readonly benchFaults: Array<Array<{ fault: Partial<BenchFaults>; fromS: number; untilS: number }>>;
  private readonly sensors: SensorSim[];
  private readonly dropoutRate: number;

  constructor(spec: WorldSpec) {
    this.startHour = spec.startHour;
    const weatherParams = { ...DEFAULT_WEATHER, ...spec.weather };
    const benchBase = { ...DEFAULT_BENCH, ...spec.bench };
    const probeParams = { ...DEFAULT_PROBE, ...spec.probe };
    this.dropoutRate = spec.dropoutRate ?? probeParams.dropoutRate;
    this.weather = new Weather(weatherParams, createRng(spec.seed, "weather"));

    this.benches = spec.benches.map((_, i) => {
      const rng = createRng(spec.seed, `bench:${i}`);
      // Benches differ a little: position in the house, pot count, mat wear.
      const params: BenchParams = {
        ...benchBase,
        lossTauH: benchBase.lossTauH * rng.uniform(0.9, 1.1),
        heaterRateCPerH: benchBase.heaterRateCPerH * rng.uniform(0.9, 1.1),
        solarRateCPerH: benchBase.solarRateCPerH * rng.uniform(0.85, 1.1),
        mediumTauH: benchBase.mediumTauH * rng.uniform(0.85, 1.15),
        matRateCPerH: benchBase.matRateCPerH * rng.uniform(0.9, 1.1),
        dryingPerH: benchBase.dryingPerH * rng.uniform(0.85, 1.15),
      };
      // The grower waters in walking order, a couple of minutes per bench.
      return new BenchModel(params, rng, ((i % 30) * 2) / 60);
    });

    const quantities = spec.benches.map(() => new Set<Quantity>());
    for (const s of spec.sensors) for (const q of KIND_QUANTITIES[s.kind]) quantities[s.bench]?.add(q);
    this.plan = planScenario(spec.scenario, {
      startHour: spec.startHour,
      benches: spec.benches.map((b, i) => ({ id: b.id, name: b.name, quantities: quantities[i] ?? new Set() })),
      sensors: spec.sensors.map((s) => ({ id: s.id, bench: s.bench })),
      affect: spec.affect ?? [],
    });
    this.benchFaults = spec.benches.map((_, i) => this.plan.benchFaults.filter((f) => f.bench === i));

    this.sensors = spec.sensors.map((s, i) => ({
      probe: new Probe(s.kind, probeParams, createRng(spec.seed, `sensor:${i}:${s.id}`)),
      bench: s.bench,
      faults: this.plan.sensorFaults.filter((f) => f.sensor === i),
      samples: 0,
      garbage: 0,
    }));

    this.simS = -(spec.warmUpH ?? 12) * 3600;
    this.advanceTo(0);
  }

  /** Step the model forward until the next step would pass simS. Never goes back. */
  advanceTo(simS: number): void {
    while (this.simS + MODEL_STEP_S <= simS) this.step(MODEL_STEP_S);
  }

  private step(dtS: number): void {
    const prevHour = hourOfDay(this.startHour, this.simS);
    this.simS += dtS;
    const hour = hourOfDay(this.startHour, this.simS);
    const weather = this.weather.step(dtS, hour);
    for (let i = 0; i < this.benches.length; i += 1) {
      this.benches[i]?.step(dtS, prevHour, hour, weather, this.faultsAt(i, this.simS));
    }
  }

  /** The faults active on bench i at simulated time simS. */
  faultsAt(bench: number, simS: number): BenchFaults {
    const spans = this.benchFaults[bench];
    if (!spans || spans.length === 0) return NO_FAULTS;
    let faults: BenchFaults = NO_FAULTS;
    for (const span of spans) {
      if (simS >= span.fromS && simS < span.untilS) faults = { ...faults, ...span.fault };
    }
    return faults;
  }

  get weatherState(): WeatherState {
    return this.weather.state;
  }

  get benchCount(): number {
    return this.benches.length;
  }

  benchState(bench: number): BenchState {
    const b = this.benches[bench];
    if (!b) throw new RangeError(`no bench ${bench}`);
    return b.state;
  }

  hourOfDay(simS = this.simS): number {
    return hourOfDay(this.startHour, simS);
  }

  /**
   * Sample sensor i at simS (advance the world to simS first). Draws from the sensor's own
   * random stream, so call it once per sample, in time order.
   */
  sample(sensor: number, simS: number): SensorOutput {
    const s = this.sensors[sensor];
    if (!s) throw new RangeError(`no sensor ${sensor}`);
    this.advanceTo(simS);
    s.samples += 1;
    let battery: number | undefined;
    let garbage = false;
    for (const f of s.faults) {
      if (f.fault === "dead") {
        if (simS >= f.fromS) return { type: "dead" };
        if (simS >= f.fromS - DEATH_SAG_S) {
          const startLevel = s.probe.batteryAt(f.fromS - DEATH_SAG_S);
          const k = (simS - (f.fromS - DEATH_SAG_S)) / DEATH_SAG_S;
          battery = startLevel + (2 - startLevel) * k;
        }
      } else if (simS >= f.fromS && simS < f.untilS && s.samples % 2 === 0) {
        garbage = true;
      }
    }
    if (!garbage && s.probe.dropsOut(this.dropoutRate)) return { type: "dropout" };
    const values = s.probe.read(this.benchState(s.bench), simS, battery);
    if (garbage) {
      s.garbage += 1;
      return { type: "garbage", n: s.garbage - 1, values };
    }
    return { type: "reading", values };
  }
}
