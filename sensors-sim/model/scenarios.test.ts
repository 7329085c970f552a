import { describe, expect, it } from "vitest";
import { DAY, HOUR, testWorld, walk } from "../testing/fixtures.js";
import { FLAP_THRESHOLD_C, SCENARIO_NAMES, planScenario } from "./scenarios.js";
import type { World } from "./world.js";

/** Min and max of a bench quantity over [fromS, toS]. */
function span(world: World, bench: number, pick: (s: ReturnType<World["benchState"]>) => number, fromS: number, toS: number) {
  let min = Infinity;
  let max = -Infinity;
  walk(world, fromS, toS, 60, () => {
    const v = pick(world.benchState(bench));
    min = Math.min(min, v);
    max = Math.max(max, v);
  });
  return { min, max };
}

const air = (s: { airC: number }) => s.airC;
const medium = (s: { mediumC: number }) => s.mediumC;
const moisture = (s: { moisture: number }) => s.moisture;

describe("scenarios", () => {
  it("normal: no faults planned", () => {
    const world = testWorld({ scenario: "normal" });
    expect(world.plan.benchFaults).toEqual([]);
    expect(world.plan.sensorFaults).toEqual([]);
  });

  it("heater-failure: at 23:00 the air of every bench leaves the window within 45 min, and recovers after the 06:30 repair", () => {
    const world = testWorld({ scenario: "heater-failure", startHour: 22.5, seed: 11 });
    expect(world.plan.targets).toEqual([0, 1, 2, 3]);
    for (let b = 0; b < 4; b += 1) expect(span(world, b, air, 0, 0.5 * HOUR - 60).min).toBeGreaterThan(21);
    walk(world, 0.5 * HOUR, 0.5 * HOUR + 45 * 60, 60, () => undefined);
    for (let b = 0; b < 4; b += 1) {
      expect(world.benchState(b).airC).toBeLessThan(21);
      expect(world.benchState(b).heaterOn).toBe(true); // the thermostat calls; nothing comes
      expect(world.faultsAt(b, world.simS).heaterFailed).toBe(true);
    }
    // Night: colder still by 04:00; the medium, kept up by its mat for a while, follows.
    const night = span(world, 0, air, 2 * HOUR, 5.5 * HOUR);
    expect(night.min).toBeLessThan(16);
    expect(span(world, 0, medium, 5.5 * HOUR, 7.9 * HOUR).min).toBeLessThan(21);
    // Repaired at 06:30 (8 h in): back in the window by 09:00.
    expect(world.faultsAt(0, 8 * HOUR + 60).heaterFailed).toBe(false);
    walk(world, 8 * HOUR, 10.5 * HOUR, 60, () => undefined);
    for (let b = 0; b < 4; b += 1) expect(world.benchState(b).airC).toBeGreaterThan(21);
  });

  it("vent-stuck-open: the vent stays open from 18:00 and the house air falls out of the window that evening", () => {
    const world = testWorld({ scenario: "vent-stuck-open", startHour: 17, seed: 12 });
    walk(world, 0, 0.9 * HOUR, 60, () => expect(world.benchState(0).vent).toBeLessThan(0.6));
    walk(world, HOUR + 60, 3 * HOUR, 60, () => expect(world.benchState(0).vent).toBe(0.6));
    expect(span(world, 0, air, 3 * HOUR, 6 * HOUR).max).toBeLessThan(21);
    for (let b = 0; b < 4; b += 1) expect(world.benchState(b).airC).toBeLessThan(21);
  });

  it("heat-mat-failure: only the chosen bench's medium cools below the window overnight", () => {
    const world = testWorld({ scenario: "heat-mat-failure", startHour: 20, seed: 13 });
    expect(world.plan.targets).toEqual([0]);
    walk(world, 0, 4 * HOUR, 60, () => undefined);
    expect(world.benchState(0).mediumC).toBeLessThan(20);
    for (let b = 1; b < 4; b += 1) expect(span(world, b, medium, 4 * HOUR, 11 * HOUR).min).toBeGreaterThan(21);
    // The air is untouched: the house heater still works.
    expect(span(world, 0, air, 4 * HOUR, 10 * HOUR).min).toBeGreaterThan(21);
  });

  it("over-watering: the chosen bench's medium goes and stays wet (above 0.55), its air turns humid; the others are fine", () => {
    const world = testWorld({ scenario: "over-watering", startHour: 9, seed: 14 });
    walk(world, 0, 3 * HOUR, 60, () => undefined);
    expect(world.benchState(0).moisture).toBeGreaterThan(0.55);
    expect(span(world, 0, moisture, 3 * HOUR, 8.4 * HOUR).min).toBeGreaterThan(0.6);
    walk(world, 8.4 * HOUR, 8.5 * HOUR, 60, () => undefined);
    expect(world.benchState(0).rh).toBeGreaterThan(world.benchState(1).rh);
    for (let b = 1; b < 4; b += 1) expect(span(world, b, moisture, 8.5 * HOUR, 12 * HOUR).max).toBeLessThanOrEqual(0.55);
    // Fixed after 8 h: drains back toward container capacity.
    expect(span(world, 0, moisture, 12 * HOUR, 14 * HOUR).max).toBeLessThan(0.55);
  });

  it("dead-sensor: the chosen sensor's battery sags, then it is dead for good; the others carry on", () => {
    const world = testWorld({ scenario: "dead-sensor", kinds: ["air", "medium"], seed: 15, dropoutRate: 0 });
    const battery: number[] = [];
    for (let t = 0; t < 0.75 * HOUR; t += 60) {
      const out = world.sample(0, t);
      expect(out.type).toBe("reading");
      if (out.type === "reading") battery.push(out.values.battery as number);
      expect(world.sample(1, t).type).toBe("reading");
    }
    expect(battery[0] as number).toBeGreaterThan(50);
    expect(battery.at(-1) as number).toBeLessThan(10);
    for (let t = 0.75 * HOUR; t < 2 * DAY; t += 600) {
      expect(world.sample(0, t).type).toBe("dead");
      expect(world.sample(1, t).type).toBe("reading");
    }
  });

  it("flapping: the chosen bench's air crosses the window's lower edge again and again all night, staying close to it", () => {
    const world = testWorld({ scenario: "flapping", startHour: 19, seed: 16 });
    let crossings = 0;
    let below = world.benchState(0).airC < FLAP_THRESHOLD_C;
    let min = Infinity;
    let max = -Infinity;
    walk(world, 2 * HOUR, 11 * HOUR, 60, () => {
      const a = world.benchState(0).airC;
      min = Math.min(min, a);
      max = Math.max(max, a);
      if (a < FLAP_THRESHOLD_C !== below) {
        crossings += 1;
        below = !below;
      }
    });
    expect(crossings).toBeGreaterThanOrEqual(20);
    expect(min).toBeGreaterThan(FLAP_THRESHOLD_C - 1);
    expect(max).toBeLessThan(FLAP_THRESHOLD_C + 1);
    // The other benches keep their normal thermostat.
    expect(span(world, 1, air, 2 * HOUR, 11 * HOUR).min).toBeGreaterThan(21.5);
  });

  it("garbage: the chosen sensor sends garbage in place of every other sample, numbered for the payload builder", () => {
    const world = testWorld({ scenario: "garbage", seed: 17, dropoutRate: 0 });
    const types = Array.from({ length: 40 }, (_, i) => world.sample(0, i * 60));
    const garbage = types.filter((o) => o.type === "garbage");
    expect(garbage).toHaveLength(20);
    expect(garbage.map((g) => (g.type === "garbage" ? g.n : -1))).toEqual(Array.from({ length: 20 }, (_, i) => i));
    expect(types.filter((o) => o.type === "reading")).toHaveLength(20);
    expect(Array.from({ length: 40 }, (_, i) => world.sample(1, i * 60).type).every((t) => t === "reading")).toBe(true);
  });

  it("--affect picks benches by id or name, sensors by id, and refuses what matches nothing", () => {
    expect(testWorld({ scenario: "heat-mat-failure", affect: ["Bench C"] }).plan.targets).toEqual([2]);
    expect(testWorld({ scenario: "heater-failure", affect: ["102", "bench d"] }).plan.targets).toEqual([1, 3]);
    expect(testWorld({ scenario: "dead-sensor", affect: ["probe-2-1"] }).plan.targets).toEqual([1]);
    expect(() => testWorld({ scenario: "flapping", affect: ["Bench Z"] })).toThrow(/matches no bench/);
    expect(() => testWorld({ scenario: "garbage", affect: ["nobody"] })).toThrow(/matches no sensor/);
  });

  it("a bench fault goes to the first bench that has the probe it needs", () => {
    const plan = planScenario("heat-mat-failure", {
      startHour: 20,
      benches: [
        { id: "1", name: "Air only", quantities: new Set(["air.temperature", "air.humidity"]) },
        { id: "2", name: "With medium", quantities: new Set(["medium.temperature"]) },
      ],
      sensors: [],
      affect: [],
    });
    expect(plan.targets).toEqual([1]);
    expect(plan.description).toBe("heat-mat-failure: With medium: heat mat off from 20:30 to 08:00");
  });

  it("every scenario plans without error on a mixed fleet and describes itself", () => {
    for (const name of SCENARIO_NAMES) {
      const world = testWorld({ scenario: name, kinds: ["air", "medium"] });
      expect(world.plan.description.startsWith(`${name}:`)).toBe(true);
    }
  });
});
