import type { SensorKind } from "../../shared/schemas/quantities.js";
import { World, type WorldSpec } from "../model/world.js";

export interface TestWorldOptions extends Partial<Omit<WorldSpec, "benches" | "sensors">> {
  /** How many benches (default 4), named Bench A, Bench B… with ids 101, 102… */
  benchCount?: number;
  /** The probes on each bench (default one combined probe), ids probe-<bench>-<n>. */
  kinds?: SensorKind[];
}

/** A small test site. */
export function testWorld(opts: TestWorldOptions = {}): World {
  const { benchCount = 4, kinds = ["combined"], ...rest } = opts;
  const benches = Array.from({ length: benchCount }, (_, i) => ({ id: String(101 + i), name: `Bench ${String.fromCharCode(65 + i)}` }));
  const sensors = benches.flatMap((_, b) => kinds.map((kind, k) => ({ id: `probe-${b + 1}-${k + 1}`, kind, bench: b })));
  return new World({ seed: 1, startHour: 0, scenario: "normal", ...rest, benches, sensors });
}

/** Step a world through [fromS, toS] every stepS seconds, calling fn at each point. */
export function walk(world: World, fromS: number, toS: number, stepS: number, fn: (simS: number) => void): void {
  for (let t = fromS; t <= toS; t += stepS) {
    world.advanceTo(t);
    fn(t);
  }
}

export const HOUR = 3600;
export const DAY = 24 * HOUR;
