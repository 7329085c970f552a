/**
 * sensors-sim: the simulated sensor fleet (issue #8). `npm run sim -- --help` lists the options.
 *
 * Demo mode starts it as a child process with `--broker … --credentials … --interval 5s` and
 * stops it with SIGTERM. It also stops by itself at --count or --duration.
 */
import { pathToFileURL } from "node:url";
import { CommanderError } from "commander";
import { buildProgram, resolveRun, type CliOptions } from "./cli.js";
import { formatClock } from "./duration.js";
import { runFleet, type FleetSummary } from "./fleet.js";
import { formatProgress, formatSummary } from "./report.js";

// What other code (the server's demo mode, tests outside sensors-sim) may use.
export { buildProgram, resolveRun, defaultCredentialsPath, DEFAULT_BROKER } from "./cli.js";
export { runFleet } from "./fleet.js";
export type { FleetConfig, FleetSummary, FleetProgress, FleetHooks } from "./fleet.js";
export { loadCredentials, fleetFromCredentials, syntheticFleet, credentialsFileSchema } from "./credentials.js";
export type { SensorCredential, SimSensor, SimBench, Fleet } from "./credentials.js";
export { World } from "./model/world.js";
export type { WorldSpec, SensorOutput } from "./model/world.js";
export { SCENARIO_NAMES, SCENARIOS, FLAP_THRESHOLD_C } from "./model/scenarios.js";
export type { ScenarioName } from "./model/scenarios.js";
export { buildReadingPack, encodePack, readingsTopic, statusTopic, baseName, OFFLINE_PAYLOAD } from "./payload/senml.js";
export type { SenmlPack, SenmlRecord, TimedSample } from "./payload/senml.js";
export { GARBAGE_KINDS, garbagePayload, OVERSIZED_BYTES } from "./payload/garbage.js";
export type { GarbageKind, GarbagePayload, GarbageExpectation } from "./payload/garbage.js";

/** Run the CLI with `argv` (the user's arguments); resolves with the exit code. */
export async function main(argv: readonly string[], signal?: AbortSignal): Promise<number> {
  const program = buildProgram().exitOverride();
  try {
    program.parse([...argv], { from: "user" });
  } catch (err) {
    if (err instanceof CommanderError) return err.exitCode;
    throw err;
  }
  const options = program.opts<CliOptions>();

  let run;
  try {
    run = await resolveRun(options);
  } catch (err) {
    process.stderr.write(`sensors-sim: ${(err as Error).message}\n`);
    return 2;
  }
  const { config, notes } = run;
  const say = (line: string) => {
    if (!run.quiet) process.stderr.write(`sensors-sim: ${line}\n`);
  };
  for (const note of notes) say(note);
  say(
    `${config.sensors.length} sensors on ${config.benches.length} benches → ${config.brokerUrl} (QoS ${config.qos}), ` +
      `every ${config.intervalMs / 1000}s, speed ${config.speed}×, sim clock from ${formatClock(config.startHour)}` +
      (config.count !== undefined ? `, ${config.count} samples each` : "") +
      (config.durationMs !== undefined ? `, for ${config.durationMs / 1000}s` : ""),
  );

  const isTty = process.stderr.isTTY === true;
  const progressMs = run.quiet ? 0 : (run.progressMs ?? (isTty ? 1000 : 30_000));
  let progressShown = false;
  let summary: FleetSummary;
  try {
    summary = await runFleet(config, {
      ...(signal ? { signal } : {}),
      progressMs,
      onPlan: (description) => say(description),
      onProgress: (p) => {
        const line = formatProgress(p, config.qos);
        if (isTty) {
          process.stderr.write(`\r\x1b[2K${line}`);
          progressShown = true;
        } else process.stderr.write(`${line}\n`);
      },
      onEvent: (message) => {
        if (progressShown) process.stderr.write("\n");
        progressShown = false;
        say(message);
      },
    });
  } catch (err) {
    process.stderr.write(`\nsensors-sim: ${(err as Error).message}\n`);
    return 2;
  }
  if (progressShown) process.stderr.write("\n");
  process.stdout.write(`${run.json ? JSON.stringify(summary) : formatSummary(summary, config.speed)}\n`);
  // A run that reached its end without getting anything through did not do its job.
  if (summary.stoppedBy !== "signal" && summary.packs > 0 && summary.acknowledged === 0) return 1;
  return 0;
}

const isEntryPoint = process.argv[1] !== undefined && import.meta.url === pathToFileURL(process.argv[1]).href;
if (isEntryPoint) {
  const controller = new AbortController();
  let signals = 0;
  const onSignal = (name: NodeJS.Signals) => {
    signals += 1;
    // First signal: stop producing, drain briefly, disconnect. Second: leave now.
    if (signals > 1) process.exit(name === "SIGINT" ? 130 : 143);
    controller.abort();
  };
  process.on("SIGINT", onSignal);
  process.on("SIGTERM", onSignal);
  main(process.argv.slice(2), controller.signal).then(
    (code) => {
      process.exitCode = code;
      // Everything is closed by now; don't let a stray socket keep the process alive.
      setTimeout(() => process.exit(code), 500).unref();
    },
    (err: unknown) => {
      process.stderr.write(`sensors-sim: ${err instanceof Error ? (err.stack ?? err.message) : String(err)}\n`);
      process.exit(1);
    },
  );
}
