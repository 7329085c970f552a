import type { Quantity, SensorKind } from "../../shared/schemas/quantities.js";
import type { BenchState } from "./bench.js";
import { PROBE_RANGE, type ProbeParams } from "./params.js";
import type { Rng } from "./random.js";
import { clamp } from "./weather.js";

/** The quantities each kind of probe reports (battery always comes too). */
export const KIND_QUANTITIES: Record<SensorKind, readonly Quantity[]> = {
  air: ["air.temperature", "air.humidity"],
  medium: ["medium.temperature", "medium.moisture"],
  combined: ["air.temperature", "air.humidity", "medium.temperature", "medium.moisture"],
};

/** One sample as a probe reports it: SI units (°C, %RH, m³/m³, %EL), quantised. */
export type ProbeValues = Partial<Record<Quantity, number>>;

/** Round to a multiple of step, without binary noise in the decimals (0.30000000000000004). */
export function quantise(value: number, step: number): number {
  const decimals = Math.max(0, Math.ceil(-Math.log10(step) - 1e-9));
  return Number((Math.round(value / step) * step).toFixed(decimals));
}

/**
 * A probe: fixed calibration bias drawn when it is "built", noise per reading, quantisation to
 * its resolution, saturation at its measuring range, a battery slowly running down.
 */
export class Probe {
  private readonly bias: { airC: number; rh: number; mediumC: number; moisture: number };
  private readonly batteryStart: number;

  constructor(
    readonly kind: SensorKind,
    private readonly p: ProbeParams,
    private readonly rng: Rng,
  ) {
    this.bias = {
      airC: rng.normal() * p.bias.airC,
      rh: rng.normal() * p.bias.rh,
      mediumC: rng.normal() * p.bias.mediumC,
      moisture: rng.normal() * p.bias.moisture,
    };
    this.batteryStart = rng.uniform(p.batteryStart[0], p.batteryStart[1]);
  }

  /** Battery charge at simulated time simS, %EL (before any scenario sag). */
  batteryAt(simS: number): number {
    return clamp(this.batteryStart - (this.p.batteryDrainPerDay * simS) / 86_400, 0, 100);
  }

  /** Whether this sample is lost (draws from the probe's stream, so call once per sample). */
  dropsOut(rate = this.p.dropoutRate): boolean {
    return this.rng.chance(rate);
  }

  /** Measure the bench. `battery` overrides the charge (a dying sensor's sag). */
  read(bench: BenchState, simS: number, battery?: number): ProbeValues {
    const { noise, step } = this.p;
    const out: ProbeValues = {};
    const put = (q: Quantity, value: number, resolution: number) => {
      const [min, max] = PROBE_RANGE[q];
      out[q] = quantise(clamp(value, min, max), resolution);
    };
    for (const q of KIND_QUANTITIES[this.kind]) {
      switch (q) {
        case "air.temperature":
          put(q, bench.airC + this.bias.airC + this.rng.normal() * noise.airC, step.airC);
          break;
        case "air.humidity":
          put(q, bench.rh + this.bias.rh + this.rng.normal() * noise.rh, step.rh);
          break;
        case "medium.temperature":
          put(q, bench.mediumC + this.bias.mediumC + this.rng.normal() * noise.mediumC, step.mediumC);
          break;
        case "medium.moisture":
          put(q, bench.moisture + this.bias.moisture + this.rng.normal() * noise.moisture, step.moisture);
          break;
        case "battery":
          break;
      }
    }
    put("battery", battery ?? this.batteryAt(simS), 1);
    return out;
  }
}
