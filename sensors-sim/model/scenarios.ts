import type { Quantity } from "../../shared/schemas/quantities.js";
import type { BenchFaults } from "./bench.js";
import { formatClock } from "../duration.js";
import { hourOfDay, secondsUntilHour } from "./weather.js";

/** The scenarios `--scenario` accepts, in the order `--help` lists them. */
export const SCENARIO_NAMES = [
  "normal",
  "heater-failure",
  "vent-stuck-open",
  "heat-mat-failure",
  "over-watering",
  "dead-sensor",
  "flapping",
  "garbage",
] as const;
export type ScenarioName = (typeof SCENARIO_NAMES)[number];

export function isScenarioName(name: string): name is ScenarioName {
  return (SCENARIO_NAMES as readonly string[]).includes(name);
}

/** A fault on one bench for a span of simulated time [fromS, untilS). */
export interface BenchFaultSpan {
  bench: number;
  fault: Partial<BenchFaults>;
  fromS: number;
  untilS: number;
}

/** A fault on one sensor from fromS on: it dies, or sends garbage in place of every other pack. */
export interface SensorFaultSpan {
  sensor: number;
  fault: "dead" | "garbage";
  fromS: number;
  untilS: number;
}

export interface ScenarioPlan {
  scenario: ScenarioName;
  benchFaults: BenchFaultSpan[];
  sensorFaults: SensorFaultSpan[];
  /** Indices of the benches or sensors the fault hits. */
  targets: number[];
  /** One line saying what will happen, for the CLI. */
  description: string;
}

/** What a scenario needs to know about the fleet to plan its faults. */
export interface ScenarioContext {
  startHour: number;
  benches: ReadonlyArray<{ id: string; name: string; quantities: ReadonlySet<Quantity> }>;
  sensors: ReadonlyArray<{ id: string; bench: number }>;
  /** Bench ids or names (or sensor ids, for sensor faults) the user asked to hit; empty: default. */
  affect: readonly string[];
}

interface ScenarioDef {
  summary: string;
  /** Simulated hour of day the run starts at unless --start says otherwise (undefined: now). */
  defaultStartHour?: number;
  hits: "benches" | "sensors";
  /** Without --affect: every bench, or the first bench that reports `needs`, or the first sensor. */
  defaultTargets: "all" | "first";
  needs?: Quantity;
  plan(ctx: ScenarioContext, targets: number[]): Omit<ScenarioPlan, "scenario" | "targets" | "description"> & { what: string };
}

const H = 3600;

function clock(startHour: number, simS: number): string {
  return formatClock(hourOfDay(startHour, simS));
}

/** Seconds from `fromS` until the clock next shows `hour`, at least `minS` later. */
function nextHourAfter(startHour: number, fromS: number, hour: number, minS = 0): number {
  let d = secondsUntilHour(hourOfDay(startHour, fromS), hour);
  while (d < minS) d += 24 * H;
  return fromS + d;
}

function benchSpans(targets: number[], fault: Partial<BenchFaults>, fromS: number, untilS: number): BenchFaultSpan[] {
  return targets.map((bench) => ({ bench, fault, fromS, untilS }));
}

export const SCENARIOS: Record<ScenarioName, ScenarioDef> = {
  normal: {
    summary: "every bench healthy: day/night swing, thermostats cycling, morning watering",
    hits: "benches",
    defaultTargets: "all",
    plan: () => ({ benchFaults: [], sensorFaults: [], what: "no faults" }),
  },
  "heater-failure": {
    summary: "the house heater trips at 23:00 and stays off until 06:30 (starts 22:30)",
    defaultStartHour: 22.5,
    hits: "benches",
    defaultTargets: "all",
    plan: (ctx, targets) => {
      const fromS = nextHourAfter(ctx.startHour, 0, 23);
      const untilS = nextHourAfter(ctx.startHour, fromS, 6.5);
      return {
        benchFaults: benchSpans(targets, { heaterFailed: true }, fromS, untilS),
        sensorFaults: [],
        what: `heater off from ${clock(ctx.startHour, fromS)} to ${clock(ctx.startHour, untilS)}`,
      };
    },
  },
  "vent-stuck-open": {
    summary: "a vent sticks open at 18:00 as the night falls, until 07:00 (starts 17:00)",
    defaultStartHour: 17,
    hits: "benches",
    defaultTargets: "all",
    plan: (ctx, targets) => {
      const fromS = nextHourAfter(ctx.startHour, 0, 18);
      const untilS = nextHourAfter(ctx.startHour, fromS, 7);
      return {
        benchFaults: benchSpans(targets, { ventStuckOpen: true }, fromS, untilS),
        sensorFaults: [],
        what: `vent stuck open from ${clock(ctx.startHour, fromS)} to ${clock(ctx.startHour, untilS)}`,
      };
    },
  },
  "heat-mat-failure": {
    summary: "one bench's heat mat fails 30 min in, repaired at 08:00 (starts 20:00)",
    defaultStartHour: 20,
    hits: "benches",
    defaultTargets: "first",
    needs: "medium.temperature",
    plan: (ctx, targets) => {
      const fromS = 0.5 * H;
      const untilS = nextHourAfter(ctx.startHour, fromS, 8, 4 * H);
      return {
        benchFaults: benchSpans(targets, { matFailed: true }, fromS, untilS),
        sensorFaults: [],
        what: `heat mat off from ${clock(ctx.startHour, fromS)} to ${clock(ctx.startHour, untilS)}`,
      };
    },
  },
  "over-watering": {
    summary: "an irrigation line runs on over one bench for 8 h, its pots standing in water",
    hits: "benches",
    defaultTargets: "first",
    needs: "medium.moisture",
    plan: (ctx, targets) => {
      const fromS = 0.5 * H;
      const untilS = fromS + 8 * H;
      return {
        benchFaults: benchSpans(targets, { overWatering: true }, fromS, untilS),
        sensorFaults: [],
        what: `irrigation running from ${clock(ctx.startHour, fromS)} to ${clock(ctx.startHour, untilS)}`,
      };
    },
  },
  "dead-sensor": {
    summary: "one sensor's battery sags and it goes silent 45 min in (its last will says offline)",
    hits: "sensors",
    defaultTargets: "first",
    plan: (ctx, targets) => {
      const fromS = 0.75 * H;
      return {
        benchFaults: [],
        sensorFaults: targets.map((sensor) => ({ sensor, fault: "dead" as const, fromS, untilS: Infinity })),
        what: `dies at ${clock(ctx.startHour, fromS)}`,
      };
    },
  },
  flapping: {
    summary: "one bench's heater thermostat is mis-set to 21.0 °C, so the air flaps across the window's lower edge all night (starts 19:00)",
    defaultStartHour: 19,
    hits: "benches",
    defaultTargets: "first",
    needs: "air.temperature",
    plan: (ctx, targets) => {
      const untilS = nextHourAfter(ctx.startHour, 0, 7, H);
      return {
        benchFaults: benchSpans(targets, { airSetpointC: FLAP_THRESHOLD_C, airDeadBandC: 0.6 }, 0, untilS),
        sensorFaults: [],
        what: `air thermostat at ${FLAP_THRESHOLD_C} °C until ${clock(ctx.startHour, untilS)}`,
      };
    },
  },
  garbage: {
    summary: "one sensor sends a malformed or invalid pack in place of every other one (for bad-input tests)",
    hits: "sensors",
    defaultTargets: "first",
    plan: (_ctx, targets) => ({
      benchFaults: [],
      sensorFaults: targets.map((sensor) => ({ sensor, fault: "garbage" as const, fromS: 0, untilS: Infinity })),
      what: "sends garbage from the start",
    }),
  },
};

/** The temperature the flapping scenario's air wanders across: the common-practice window's lower edge. */
export const FLAP_THRESHOLD_C = 21;

export function scenarioDefaultStartHour(name: ScenarioName): number | undefined {
  return SCENARIOS[name].defaultStartHour;
}

/** Resolve a scenario against a fleet: who is hit, when, and a line describing it. */
export function planScenario(name: ScenarioName, ctx: ScenarioContext): ScenarioPlan {
  const def = SCENARIOS[name];
  const targets = resolveTargets(name, def, ctx);
  const { what, ...plan } = def.plan(ctx, targets);
  const names =
    def.hits === "benches"
      ? targets.map((i) => ctx.benches[i]?.name ?? String(i))
      : targets.map((i) => ctx.sensors[i]?.id ?? String(i));
  const who =
    name === "normal"
      ? ""
      : def.hits === "benches" && targets.length === ctx.benches.length && targets.length > 1
        ? `all ${targets.length} benches: `
        : `${names.join(", ")}: `;
  return { scenario: name, targets, description: `${name}: ${who}${what}`, ...plan };
}

function resolveTargets(name: ScenarioName, def: ScenarioDef, ctx: ScenarioContext): number[] {
  if (name === "normal") return [];
  const want = ctx.affect.map((a) => a.trim().toLowerCase()).filter(Boolean);
  if (def.hits === "sensors") {
    if (want.length > 0) {
      const hit = ctx.sensors.flatMap((s, i) => (want.includes(s.id.toLowerCase()) ? [i] : []));
      if (hit.length === 0) throw new Error(`--affect matches no sensor id (scenario ${name})`);
      return hit;
    }
    return ctx.sensors.length > 0 ? [0] : [];
  }
  const eligible = ctx.benches.flatMap((b, i) => (!def.needs || b.quantities.has(def.needs) ? [i] : []));
  if (want.length > 0) {
    const hit = eligible.filter((i) => {
      const b = ctx.benches[i];
      return b !== undefined && (want.includes(b.id.toLowerCase()) || want.includes(b.name.toLowerCase()));
    });
    if (hit.length === 0) {
      throw new Error(`--affect matches no bench id or name${def.needs ? ` with a ${def.needs} probe` : ""} (scenario ${name})`);
    }
    return hit;
  }
  if (def.defaultTargets === "all") return eligible;
  return eligible.slice(0, 1);
}
