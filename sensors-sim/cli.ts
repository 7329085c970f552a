import { existsSync } from "node:fs";
import { dirname, join } from "node:path";
import { Command, InvalidArgumentError, Option } from "commander";
import { fleetFromCredentials, loadCredentials, syntheticFleet, type Fleet } from "./credentials.js";
import { parseClock, parseDuration } from "./duration.js";
import type { FleetConfig } from "./fleet.js";
import { SCENARIO_NAMES, SCENARIOS, isScenarioName, scenarioDefaultStartHour, type ScenarioName } from "./model/scenarios.js";

export const DEFAULT_BROKER = "mqtt://127.0.0.1:1883";
/** Sensors played without a credentials file. */
export const DEFAULT_SYNTHETIC_SENSORS = 12;

/** The options as commander hands them over. */
export interface CliOptions {
  broker: string;
  credentials?: string;
  sensors?: number;
  interval: number;
  speed: number;
  duration?: number;
  count?: number;
  scenario: ScenarioName;
  seed?: number;
  qos: 0 | 1;
  start?: number;
  affect?: string[];
  batch: number;
  buffer: number;
  dropouts: number;
  drain: number;
  progress?: number;
  json?: boolean;
  quiet?: boolean;
}

function positiveInt(name: string) {
  return (text: string): number => {
    const n = Number(text);
    if (!Number.isInteger(n) || n < 1) throw new InvalidArgumentError(`${name} must be a whole number ≥ 1.`);
    return n;
  };
}

function duration(name: string, minMs: number) {
  return (text: string): number => {
    let ms: number;
    try {
      ms = parseDuration(text);
    } catch (err) {
      throw new InvalidArgumentError((err as Error).message);
    }
    if (ms < minMs) throw new InvalidArgumentError(`${name} must be at least ${minMs} ms.`);
    return ms;
  };
}

function scenarioHelp(): string {
  const width = Math.max(...SCENARIO_NAMES.map((s) => s.length));
  const lines = SCENARIO_NAMES.map((name) => `  ${name.padEnd(width)}  ${SCENARIOS[name].summary}`);
  return [
    "",
    "Scenarios:",
    ...lines,
    "",
    "Times of day are simulated. Readings carry wall-clock times, so the dashboard shows them live;",
    "--speed only makes the simulated greenhouse run faster (60: a night in about ten minutes).",
    "Fault scenarios hit every bench, or the first bench (or sensor) they apply to; --affect picks.",
    "",
    "Examples:",
    "  npm run sim -- --scenario heater-failure --speed 60",
    "  npm run sim -- --credentials data/demo-sensors.json --interval 5s",
    "  npm run sim -- --sensors 2000 --interval 10s --qos 0 --duration 2m   (load)",
  ].join("\n");
}

/** The commander program; parse with `.parse(argv, { from: "user" })`, read `.opts<CliOptions>()`. */
export function buildProgram(): Command {
  return new Command()
    .name("sensors-sim")
    .description("Play a fleet of Benchwarden bench probes: simulated greenhouse readings as SenML over MQTT.")
    .option("--broker <url>", "MQTT broker to publish to", DEFAULT_BROKER)
    .option(
      "--credentials <file>",
      "sensors to play, JSON [{ id, secret, benchId, benchName, kind }] (default: demo-sensors.json beside DATABASE_PATH, else data/demo-sensors.json; with none, made-up sensors sim-0001… for an open broker)",
    )
    .option("--sensors <n>", `how many sensors to play; beyond the file's, its entries are reused (default: one per entry, or ${DEFAULT_SYNTHETIC_SENSORS})`, positiveInt("--sensors"))
    .addOption(
      new Option("--interval <time>", "wall-clock time between one sensor's samples (ms, s, m, h)")
        .argParser(duration("--interval", 10))
        .default(5000, "5s"),
    )
    .option(
      "--speed <x>",
      "simulated seconds per real second (60: an hour a minute)",
      (text: string) => {
        const x = Number(text);
        if (!Number.isFinite(x) || x <= 0 || x > 86_400) throw new InvalidArgumentError("--speed must be a number above 0 and at most 86400.");
        return x;
      },
      1,
    )
    .option("--duration <time>", "stop after this long (wall clock); with neither this nor --count, run until SIGINT/SIGTERM", duration("--duration", 1))
    .option("--count <n>", "stop after n samples per sensor", positiveInt("--count"))
    .addOption(
      new Option("--scenario <name>", "what happens in the greenhouse (see Scenarios below)")
        .choices(SCENARIO_NAMES)
        .default("normal"),
    )
    .option("--seed <n>", "seed of the random numbers; the same seed and options give the same readings (default: random, printed)", (text: string) => {
      const n = Number(text);
      if (!Number.isInteger(n) || n < 0 || n > 0xffffffff) throw new InvalidArgumentError("--seed must be a whole number from 0 to 4294967295.");
      return n;
    })
    .addOption(
      new Option("--qos <0|1>", "MQTT QoS of the readings")
        .default(1)
        .argParser((text: string) => {
          if (text !== "0" && text !== "1") throw new InvalidArgumentError("--qos must be 0 or 1.");
          return text === "0" ? 0 : 1;
        }),
    )
    .option("--start <HH:MM>", "simulated time of day at the start (default: now, or the scenario's start)", (text: string) => {
      try {
        return parseClock(text);
      } catch (err) {
        throw new InvalidArgumentError((err as Error).message);
      }
    })
    .option("--affect <list>", "comma-separated bench ids or names (sensor ids for dead-sensor, garbage) the scenario hits", (text: string) =>
      text.split(",").map((s) => s.trim()).filter(Boolean),
    )
    .option("--batch <n>", "samples per pack, sent with relative times", positiveInt("--batch"), 1)
    .option("--buffer <n>", "packs each sensor keeps while the broker is away (oldest dropped beyond)", positiveInt("--buffer"), 720)
    .option(
      "--dropouts <rate>",
      "share of samples lost, 0–1",
      (text: string) => {
        const x = Number(text);
        if (!Number.isFinite(x) || x < 0 || x > 1) throw new InvalidArgumentError("--dropouts must be between 0 and 1.");
        return x;
      },
      0.002,
    )
    .addOption(
      new Option("--drain <time>", "at the end, how long to wait for buffers and acknowledgements")
        .argParser(duration("--drain", 0))
        .default(10_000, "10s"),
    )
    .option("--progress <time>", "progress line every … (0: none; default 1s on a terminal, 30s otherwise)", duration("--progress", 0))
    .option("--json", "print the summary as JSON")
    .option("-q, --quiet", "no progress line and no notes")
    .helpOption("-h, --help", "show this help")
    .addHelpText("after", scenarioHelp())
    .showHelpAfterError("(run with --help for the options)")
    .allowExcessArguments(false);
}

/** Where demo mode writes demo-sensors.json (PRODUCT.md §4): beside the database file. */
export function defaultCredentialsPath(env: NodeJS.ProcessEnv = process.env, cwd = process.cwd()): string {
  const db = env.DATABASE_PATH;
  return db ? join(dirname(db), "demo-sensors.json") : join(cwd, "data", "demo-sensors.json");
}

export interface ResolvedRun {
  config: FleetConfig;
  fleet: Fleet;
  /** Lines worth telling the user before the run (which file, which seed). */
  notes: string[];
  json: boolean;
  quiet: boolean;
  progressMs: number | undefined;
}

/** Turn parsed options into a fleet configuration: read credentials, pick seed and start time. */
export async function resolveRun(
  o: CliOptions,
  env: NodeJS.ProcessEnv = process.env,
  now: Date = new Date(),
  randomSeed: () => number = () => Math.floor(Math.random() * 1_000_000),
): Promise<ResolvedRun> {
  const notes: string[] = [];
  let fleet: Fleet;
  if (o.credentials) {
    fleet = fleetFromCredentials(await loadCredentials(o.credentials), o.sensors);
    notes.push(`credentials: ${o.credentials}`);
  } else {
    const path = defaultCredentialsPath(env);
    if (existsSync(path)) {
      fleet = fleetFromCredentials(await loadCredentials(path), o.sensors);
      notes.push(`credentials: ${path}`);
    } else {
      fleet = syntheticFleet(o.sensors ?? DEFAULT_SYNTHETIC_SENSORS);
      notes.push(`no credentials file (looked for ${path}): playing made-up sensors sim-…, which only an open broker accepts`);
    }
  }
  if (!isScenarioName(o.scenario)) throw new Error(`unknown scenario ${String(o.scenario)}`);
  const seed = o.seed ?? randomSeed();
  if (o.seed === undefined) notes.push(`seed ${seed} (pass --seed ${seed} to repeat this run)`);
  const startHour = o.start ?? scenarioDefaultStartHour(o.scenario) ?? now.getHours() + now.getMinutes() / 60;
  const config: FleetConfig = {
    brokerUrl: o.broker,
    benches: fleet.benches,
    sensors: fleet.sensors,
    intervalMs: o.interval,
    speed: o.speed,
    ...(o.duration !== undefined ? { durationMs: o.duration } : {}),
    ...(o.count !== undefined ? { count: o.count } : {}),
    scenario: o.scenario,
    seed,
    qos: o.qos,
    startHour,
    batch: o.batch,
    bufferLimit: o.buffer,
    affect: o.affect ?? [],
    dropoutRate: o.dropouts,
    drainMs: o.drain,
    signalDrainMs: Math.min(o.drain, 1500),
  };
  return { config, fleet, notes, json: o.json === true, quiet: o.quiet === true, progressMs: o.progress };
}
