import { describe, expect, it } from "vitest";
import { BUILT_IN_PRESETS, DEFAULT_PRESET_ID } from "../../shared/domain/window-guidance.js";
import { QUANTITIES, type Quantity } from "../../shared/schemas/quantities.js";
import { DAY, HOUR, testWorld, walk } from "../testing/fixtures.js";
import { BenchModel, NO_FAULTS } from "./bench.js";
import { DEFAULT_BENCH, DEFAULT_PROBE, PROBE_RANGE } from "./params.js";
import { createRng } from "./random.js";
import type { SensorOutput } from "./world.js";

// The rooting window a normal bench must stay inside: common practice, not a published
// source (REFERENCES.md §6–7): air 21–27 °C (70–80 °F), medium 21–25 °C, moisture 0.35–0.55.
const WINDOW = {
  "air.temperature": [21, 27],
  "medium.temperature": [21, 25],
  "medium.moisture": [0.35, 0.55],
} as const;

function mean(xs: readonly number[]): number {
  return xs.reduce((s, x) => s + x, 0) / xs.length;
}

function correlation(xs: readonly number[], ys: readonly number[]): number {
  const mx = mean(xs);
  const my = mean(ys);
  let sxy = 0;
  let sxx = 0;
  let syy = 0;
  for (let i = 0; i < xs.length; i += 1) {
    const dx = (xs[i] as number) - mx;
    const dy = (ys[i] as number) - my;
    sxy += dx * dy;
    sxx += dx * dx;
    syy += dy * dy;
  }
  return sxy / Math.sqrt(sxx * syy);
}

/** Correlation of xs(t) with ys(t + lag), lag in samples. */
function laggedCorrelation(xs: readonly number[], ys: readonly number[], lag: number): number {
  return correlation(xs.slice(0, xs.length - lag), ys.slice(lag));
}

describe("the models on a normal bench", () => {
  it("when run for ten days over many seeds, then every true value stays physically bounded and inside the window", () => {
    const range = (): [number, number] => [Infinity, -Infinity];
    const seen = { air: range(), medium: range(), moisture: range(), rh: range(), outside: range() };
    const note = (r: [number, number], v: number) => {
      if (v < r[0]) r[0] = v;
      if (v > r[1]) r[1] = v;
    };
    for (let seed = 1; seed <= 12; seed += 1) {
      const world = testWorld({ seed, startHour: (seed * 7) % 24, benchCount: 6 });
      walk(world, 0, 10 * DAY, 120, () => {
        for (let b = 0; b < world.benchCount; b += 1) {
          const s = world.benchState(b);
          note(seen.air, s.airC);
          note(seen.medium, s.mediumC);
          note(seen.moisture, s.moisture);
          note(seen.rh, s.rh);
        }
        note(seen.outside, world.weatherState.outsideC);
      });
    }
    expect(seen.air[0]).toBeGreaterThanOrEqual(WINDOW["air.temperature"][0]);
    expect(seen.air[1]).toBeLessThanOrEqual(WINDOW["air.temperature"][1]);
    expect(seen.medium[0]).toBeGreaterThanOrEqual(WINDOW["medium.temperature"][0]);
    expect(seen.medium[1]).toBeLessThanOrEqual(WINDOW["medium.temperature"][1]);
    expect(seen.moisture[0]).toBeGreaterThanOrEqual(WINDOW["medium.moisture"][0]);
    expect(seen.moisture[1]).toBeLessThanOrEqual(WINDOW["medium.moisture"][1]);
    expect(seen.rh[0]).toBeGreaterThan(50);
    expect(seen.rh[1]).toBeLessThanOrEqual(100);
    expect(seen.outside[0]).toBeGreaterThan(-25);
    expect(seen.outside[1]).toBeLessThan(35);
    // The weather did vary: not a flat line.
    expect(seen.outside[1] - seen.outside[0]).toBeGreaterThan(10);
  });

  it("when probes read a normal bench, then readings are bounded, quantised, and almost all inside the window", () => {
    const world = testWorld({ seed: 3, benchCount: 6 });
    let inside = 0;
    let total = 0;
    for (let t = 0; t <= 3 * DAY; t += 300) {
      for (let s = 0; s < 6; s += 1) {
        const out = world.sample(s, t);
        if (out.type !== "reading") continue;
        for (const q of QUANTITIES) {
          const v = out.values[q];
          expect(v, q).toBeTypeOf("number");
          const [min, max] = PROBE_RANGE[q];
          expect(v).toBeGreaterThanOrEqual(min);
          expect(v).toBeLessThanOrEqual(max);
        }
        const air = out.values["air.temperature"] as number;
        const rh = out.values["air.humidity"] as number;
        expect(Math.round(air * 10) / 10).toBe(air); // 0.1 °C resolution
        expect(Number.isInteger(rh)).toBe(true); // 1 %RH resolution
        expect(Number.isInteger(out.values.battery)).toBe(true);
        for (const q of Object.keys(WINDOW) as Array<keyof typeof WINDOW>) {
          total += 1;
          const v = out.values[q] as number;
          if (v >= WINDOW[q][0] && v <= WINDOW[q][1]) inside += 1;
        }
      }
    }
    expect(inside / total).toBeGreaterThan(0.995);
  });

  it("when run for five days, then the 24-hour period shows in outside and house air: warm afternoons, cool nights", () => {
    const world = testWorld({ seed: 5, startHour: 0 });
    const air: number[] = [];
    const outside: number[] = [];
    const byHour: number[][] = Array.from({ length: 24 }, () => []);
    walk(world, 0, 5 * DAY, 1800, () => {
      const a = world.benchState(0).airC;
      air.push(a);
      outside.push(world.weatherState.outsideC);
      byHour[Math.floor(world.hourOfDay())]?.push(a);
    });
    // Samples every 30 min: 48 per day.
    expect(laggedCorrelation(outside, outside, 48)).toBeGreaterThan(0.6);
    expect(laggedCorrelation(outside, outside, 24)).toBeLessThan(0);
    expect(laggedCorrelation(air, air, 48)).toBeGreaterThan(laggedCorrelation(air, air, 24));
    const afternoon = mean(byHour.slice(12, 16).flat());
    const night = mean(byHour.slice(1, 5).flat());
    expect(afternoon - night).toBeGreaterThan(1);
  });

  it("when the heat mat does not pin the medium, then the medium follows the air hours later", () => {
    // With the mat off the medium is free to follow the air: its correlation with the air peaks
    // at a positive lag (the air leads) and its swing is smaller.
    const world = testWorld({ seed: 2, bench: { matRateCPerH: 0 } });
    const air: number[] = [];
    const medium: number[] = [];
    walk(world, 0, 6 * DAY, 600, () => {
      air.push(world.benchState(0).airC);
      medium.push(world.benchState(0).mediumC);
    });
    const lags = Array.from({ length: 37 }, (_, lag) => laggedCorrelation(air, medium, lag)); // 0–6 h
    const best = lags.indexOf(Math.max(...lags));
    expect(best * 10).toBeGreaterThanOrEqual(30); // at least 30 min
    expect(best * 10).toBeLessThanOrEqual(300);
    const swing = (xs: number[]) => Math.max(...xs) - Math.min(...xs);
    expect(swing(medium)).toBeLessThan(swing(air));
  });

  it("when the air steps up, then the medium lags it with an hours-long time constant", () => {
    const bench = new BenchModel({ ...DEFAULT_BENCH, matRateCPerH: 0 }, createRng(1));
    const weather = { outsideC: 5, outsideVapourKpa: 0.7, cloud: 1, sun: 0 };
    const low = { ...NO_FAULTS, airSetpointC: 21 };
    const high = { ...NO_FAULTS, airSetpointC: 24.5 };
    for (let i = 0; i < 24 * 240; i += 1) bench.step(15, 0, 0, weather, low); // settle
    const air: number[] = [bench.state.airC];
    const medium: number[] = [bench.state.mediumC];
    for (let i = 1; i <= 12 * 240; i += 1) {
      bench.step(15, 0, 0, weather, high);
      air.push(bench.state.airC);
      medium.push(bench.state.mediumC);
    }
    // Time to 63 % of the final change (one time constant), in hours.
    const tau = (xs: number[]) => {
      const x0 = xs[0] as number;
      const target = x0 + 0.63 * ((xs.at(-1) as number) - x0);
      return xs.findIndex((x) => x >= target) / 240;
    };
    expect((medium.at(-1) as number) - (medium[0] as number)).toBeGreaterThan(1.5);
    expect(tau(air)).toBeLessThan(1);
    expect(tau(medium) - tau(air)).toBeGreaterThan(0.5);
  });

  it("when the demo's fleet runs a normal week, then no probe stays outside the Warm rooting window longer than its hold-off", () => {
    // The demo nursery starts every zone on this preset: a quiet night must raise no alert.
    const preset = BUILT_IN_PRESETS.find((p) => p.id === DEFAULT_PRESET_ID)!;
    for (const seed of [11, 12]) {
      // Combined probes: each reports all four windowed quantities.
      const world = testWorld({ seed, benchCount: 4, kinds: ["combined"] });
      const outsideSinceS = new Map<string, number>();
      walk(world, 0, 7 * DAY, 60, (t) => {
        for (let s = 0; s < 4; s += 1) {
          const out = world.sample(s, t);
          if (out.type !== "reading") continue;
          for (const w of preset.windows) {
            const v = out.values[w.quantity];
            if (v === undefined) continue;
            const key = `${s}:${w.quantity}`;
            if (v >= w.min && v <= w.max) {
              outsideSinceS.delete(key);
              continue;
            }
            const since = outsideSinceS.get(key) ?? t;
            outsideSinceS.set(key, since);
            expect(t - since, `seed ${seed}, probe ${s}, ${w.quantity} = ${v} at ${(t / HOUR).toFixed(1)} h`).toBeLessThan(w.delayS);
          }
        }
      });
    }
  });

  it("when the air warms, then its relative humidity falls; after watering it rises", () => {
    const world = testWorld({ seed: 4, startHour: 0 });
    const air: number[] = [];
    const rh: number[] = [];
    walk(world, 0, 3 * DAY, 300, () => {
      air.push(world.benchState(0).airC);
      rh.push(world.benchState(0).rh);
    });
    expect(correlation(air, rh)).toBeLessThan(-0.3);

    // Watering: the same greenhouse with and without the grower's watering (same seed, so the
    // same weather), fog off in both so its humidistat does not mask the difference: 20 minutes
    // after each watering its air is more humid.
    const noFog = { fogOnRh: 0, fogOffRh: 0 };
    const watered = testWorld({ seed: 4, benchCount: 1, bench: noFog });
    const dry = testWorld({ seed: 4, benchCount: 1, bench: { ...noFog, watering: [] } });
    let waterings = 0;
    let checked = 0;
    walk(watered, 0, 4 * DAY, 60, (t) => {
      if (watered.benchState(0).waterings === waterings) return;
      waterings = watered.benchState(0).waterings;
      watered.advanceTo(t + 20 * 60);
      dry.advanceTo(t + 20 * 60);
      expect(watered.benchState(0).rh).toBeGreaterThan(dry.benchState(0).rh + 1);
      checked += 1;
    });
    expect(checked).toBeGreaterThanOrEqual(3);
  });

  it("when nobody waters, then the medium dries on a slowing curve; a watering makes it jump", () => {
    const world = testWorld({ seed: 6, bench: { watering: [] } });
    const daily: number[] = [];
    walk(world, 0, 8 * DAY, DAY, () => daily.push(world.benchState(0).moisture));
    for (let i = 1; i < daily.length; i += 1) expect(daily[i]).toBeLessThan(daily[i - 1] as number);
    const losses = daily.slice(1).map((m, i) => (daily[i] as number) - m);
    expect(losses.at(-1) as number).toBeLessThan((losses[0] as number) * 0.9); // drying slows
    expect(daily.at(-1) as number).toBeGreaterThan(DEFAULT_BENCH.residual);

    const watered = testWorld({ seed: 6 });
    let prev = watered.benchState(0);
    let jumps = 0;
    walk(watered, 0, 3 * DAY, 15, () => {
      const s = watered.benchState(0);
      if (s.waterings > prev.waterings) {
        jumps += 1;
        expect(s.moisture - prev.moisture).toBeGreaterThan(0.03);
      } else {
        expect(s.moisture).toBeLessThanOrEqual(prev.moisture + 1e-12);
      }
      prev = s;
    });
    expect(jumps).toBeGreaterThanOrEqual(2);
  });

  it("when run for weeks, then the battery falls slowly and never rises", () => {
    const world = testWorld({ seed: 8, dropoutRate: 0 });
    const levels: number[] = [];
    for (let t = 0; t <= 30 * DAY; t += DAY) {
      const out = world.sample(0, t);
      if (out.type === "reading") levels.push(out.values.battery as number);
    }
    for (let i = 1; i < levels.length; i += 1) expect(levels[i]).toBeLessThanOrEqual(levels[i - 1] as number);
    const drop = (levels[0] as number) - (levels.at(-1) as number);
    expect(drop).toBeGreaterThanOrEqual(DEFAULT_PROBE.batteryDrainPerDay * 30 - 2);
    expect(drop).toBeLessThanOrEqual(DEFAULT_PROBE.batteryDrainPerDay * 30 + 2);
  });

  it("when the dropout rate is 10 %, then about one sample in ten is lost", () => {
    const world = testWorld({ seed: 9, dropoutRate: 0.1, benchCount: 1 });
    let lost = 0;
    const n = 5000;
    for (let i = 0; i < n; i += 1) if (world.sample(0, i * 60).type === "dropout") lost += 1;
    expect(lost / n).toBeGreaterThan(0.08);
    expect(lost / n).toBeLessThan(0.12);
  });

  it("when each probe kind is read, then it reports its own quantities and the battery", () => {
    const world = testWorld({ kinds: ["air", "medium", "combined"], benchCount: 1, dropoutRate: 0 });
    const keys = (o: SensorOutput) => (o.type === "reading" ? Object.keys(o.values).sort() : []);
    const sorted = (qs: Quantity[]) => [...qs].sort();
    expect(keys(world.sample(0, 60))).toEqual(sorted(["air.temperature", "air.humidity", "battery"]));
    expect(keys(world.sample(1, 60))).toEqual(sorted(["medium.temperature", "medium.moisture", "battery"]));
    expect(keys(world.sample(2, 60))).toEqual(sorted([...QUANTITIES]));
  });
});

describe("seeded runs", () => {
  const run = (seed: number) => {
    const world = testWorld({ seed, benchCount: 3, kinds: ["air", "medium"], dropoutRate: 0.05 });
    const outputs: SensorOutput[] = [];
    for (let t = 0; t <= DAY; t += 600) for (let s = 0; s < 6; s += 1) outputs.push(world.sample(s, t));
    return outputs;
  };

  it("when the seed is the same, then the run is the same, reading for reading", () => {
    expect(run(1234)).toEqual(run(1234));
  });

  it("when the seed differs, then the readings differ", () => {
    expect(run(1234)).not.toEqual(run(1235));
  });

  it("when a sensor is added to the fleet, then the other sensors' readings do not change", () => {
    const spec = { seed: 77, benchCount: 2 };
    const a = testWorld({ ...spec, kinds: ["combined"] });
    const b = testWorld({ ...spec, kinds: ["combined", "air"] });
    for (let t = 0; t <= 6 * HOUR; t += 600) {
      expect(b.sample(0, t)).toEqual(a.sample(0, t)); // probe-1-1 in both
    }
  });
});
