import type { SimBench, SimSensor } from "./credentials.js";
import { formatClock } from "./duration.js";
import { createRng, type Rng } from "./model/random.js";
import type { ScenarioName } from "./model/scenarios.js";
import { World } from "./model/world.js";
import { GARBAGE_KINDS, garbagePayload } from "./payload/garbage.js";
import { buildReadingPack, encodePack, readingsTopic, type TimedSample } from "./payload/senml.js";
import { SimDevice, type Publication } from "./transport/device.js";
import type { BackoffOptions } from "./transport/backoff.js";

export interface FleetConfig {
  brokerUrl: string;
  benches: readonly SimBench[];
  sensors: readonly SimSensor[];
  /** Wall-clock time between one sensor's samples, ms. */
  intervalMs: number;
  /** Simulated seconds per wall-clock second. */
  speed: number;
  /** Stop producing after this much wall-clock time, ms. */
  durationMs?: number;
  /** Stop after this many samples per sensor. */
  count?: number;
  scenario: ScenarioName;
  seed: number;
  qos: 0 | 1;
  /** Simulated hour of day at the start (0–24). */
  startHour: number;
  /** Samples per pack (relative times inside); 1 = a pack per sample. */
  batch: number;
  /** Packs kept per sensor while offline. */
  bufferLimit: number;
  affect: readonly string[];
  dropoutRate?: number;
  /** How long to wait at the end for buffers and acknowledgements, ms. */
  drainMs: number;
  /** The same after SIGINT/SIGTERM (shorter: whoever signals wants us gone). */
  signalDrainMs: number;
  /** Connections are opened spread over this long, so a big fleet does not storm the broker, ms. */
  connectSpreadMs?: number;
  backoff?: BackoffOptions;
}

export interface FleetProgress {
  elapsedMs: number;
  /** Simulated time since the start, s, and the simulated clock. */
  simS: number;
  simClock: string;
  sensors: number;
  online: number;
  dead: number;
  samples: number;
  packs: number;
  readings: number;
  garbage: number;
  dropouts: number;
  sent: number;
  acknowledged: number;
  failed: number;
  inFlight: number;
  buffered: number;
  overflow: number;
  reconnects: number;
  refused: number;
  /** How late the scheduler ran at worst since the last progress report, ms. */
  lagMs: number;
}

export interface FleetSummary extends FleetProgress {
  stoppedBy: "count" | "duration" | "signal";
  scenario: ScenarioName;
  scenarioDescription: string;
  seed: number;
  qos: 0 | 1;
  /** Packs never sent (left in buffers) or never acknowledged when the run closed. */
  unsent: number;
  /** Readings produced per wall-clock second over the run. */
  readingsPerSecond: number;
}

export interface FleetHooks {
  /** Abort to stop the run (the CLI wires SIGINT/SIGTERM to it). */
  signal?: AbortSignal;
  /** Every publication as it is produced, before buffering (tests compare with what arrived). */
  onPublication?: (sensor: SimSensor, publication: Publication, sample: TimedSample | undefined) => void;
  onProgress?: (progress: FleetProgress) => void;
  progressMs?: number;
  /** Notable events worth a line: a connection error (first of its kind), a sensor dying. */
  onEvent?: (message: string) => void;
  /** Told once the plan is known, before anything connects. */
  onPlan?: (description: string) => void;
}

interface SensorRun {
  sensor: SimSensor;
  device: SimDevice;
  pending: TimedSample[];
  garbageRng: Rng;
  killed: boolean;
}

/**
 * Play the fleet against a broker until the count or duration is reached or the signal aborts:
 * the model (World) on a fixed simulated grid, one MQTT connection per sensor, samples spread
 * evenly over each interval. Resolves with the summary once buffers have drained (or the drain
 * time ran out) and every connection is closed.
 */
export async function runFleet(config: FleetConfig, hooks: FleetHooks = {}): Promise<FleetSummary> {
  const n = config.sensors.length;
  if (n === 0) throw new Error("no sensors to play");
  const world = new World({
    seed: config.seed,
    startHour: config.startHour,
    scenario: config.scenario,
    affect: config.affect,
    benches: config.benches,
    sensors: config.sensors.map((s) => ({ id: s.id, kind: s.kind, bench: s.bench })),
    ...(config.dropoutRate !== undefined ? { dropoutRate: config.dropoutRate } : {}),
  });
  hooks.onPlan?.(world.plan.description);

  const seenErrors = new Set<string>();
  const runs: SensorRun[] = config.sensors.map((sensor, i) => ({
    sensor,
    device: new SimDevice({
      brokerUrl: config.brokerUrl,
      sensorId: sensor.id,
      secret: sensor.secret,
      clientId: sensor.clientId,
      qos: config.qos,
      bufferLimit: config.bufferLimit,
      rng: createRng(config.seed, `backoff:${i}`),
      ...(config.backoff ? { backoff: config.backoff } : {}),
      onError: (id, message) => {
        if (seenErrors.has(message) || seenErrors.size > 20) return;
        seenErrors.add(message);
        hooks.onEvent?.(`${id}: ${message}`);
      },
    }),
    pending: [],
    garbageRng: createRng(config.seed, `garbage:${i}`),
    killed: false,
  }));

  const stats = { samples: 0, packs: 0, readings: 0, garbage: 0, dropouts: 0, lagMs: 0 };
  const wallStart = Date.now();
  const interval = config.intervalMs;
  const phase = (s: number) => (s * interval) / n;
  let simS = 0;

  // Open the connections spread out; samples taken before a sensor is online are buffered.
  const spread = config.connectSpreadMs ?? Math.min(interval, 2000);
  const connectTimers: NodeJS.Timeout[] = [];
  runs.forEach((run, s) => {
    const at = (s * spread) / n;
    if (at <= 0) run.device.start();
    else connectTimers.push(setTimeout(() => run.device.start(), at));
  });

  const emit = (run: SensorRun, publication: Publication, sample: TimedSample | undefined) => {
    hooks.onPublication?.(run.sensor, publication, sample);
    run.device.publish(publication);
  };

  const flushPending = (run: SensorRun) => {
    if (run.pending.length === 0) return;
    const pack = buildReadingPack(run.sensor.id, run.pending);
    const sample = run.pending[run.pending.length - 1];
    run.pending = [];
    stats.packs += 1;
    stats.readings += pack.length;
    emit(run, { topic: readingsTopic(run.sensor.id), payload: encodePack(pack), kind: "reading", readings: pack.length }, sample);
  };

  const produce = (s: number, k: number, dueMs: number) => {
    const run = runs[s] as SensorRun;
    if (run.killed) return;
    const sampleSimS = ((phase(s) + k * interval) * config.speed) / 1000;
    simS = Math.max(simS, sampleSimS);
    const out = world.sample(s, sampleSimS);
    stats.samples += 1;
    switch (out.type) {
      case "dead":
        flushPending(run);
        run.killed = true;
        run.device.kill();
        hooks.onEvent?.(`${run.sensor.id} died (scenario ${config.scenario}); its last will says offline`);
        return;
      case "dropout":
        stats.dropouts += 1;
        break;
      case "garbage": {
        const kind = GARBAGE_KINDS[out.n % GARBAGE_KINDS.length] ?? "not-json";
        const g = garbagePayload(kind, { sensorId: run.sensor.id, timeMs: dueMs, values: out.values, rng: run.garbageRng });
        stats.garbage += 1;
        emit(run, { topic: g.topic, payload: g.payload, kind, readings: 0, qos: 0 }, undefined);
        return;
      }
      case "reading":
        run.pending.push({ timeMs: dueMs, values: out.values });
        break;
    }
    if (run.pending.length >= config.batch) flushPending(run);
  };

  // The schedule: sample k of sensor s is due at wallStart + phase(s) + k·interval.
  let nextS = 0;
  let nextK = 0;
  const dueOf = (s: number, k: number) => wallStart + phase(s) + k * interval;
  const exhausted = () =>
    (config.count !== undefined && nextK >= config.count) ||
    (config.durationMs !== undefined && dueOf(nextS, nextK) > wallStart + config.durationMs);

  let stoppedBy: FleetSummary["stoppedBy"] | undefined;
  let timer: NodeJS.Timeout | undefined;
  let finish!: () => void;
  const produced = new Promise<void>((resolve) => {
    finish = resolve;
  });
  const stopProducing = (why: FleetSummary["stoppedBy"]) => {
    if (stoppedBy) return;
    stoppedBy = why;
    if (timer) clearTimeout(timer);
    finish();
  };

  const tick = () => {
    timer = undefined;
    if (stoppedBy) return;
    const started = Date.now();
    for (;;) {
      if (exhausted()) {
        stopProducing(config.count !== undefined && nextK >= config.count ? "count" : "duration");
        return;
      }
      const due = dueOf(nextS, nextK);
      const now = Date.now();
      if (due > now) break;
      stats.lagMs = Math.max(stats.lagMs, now - due);
      produce(nextS, nextK, due);
      nextS += 1;
      if (nextS >= n) {
        nextS = 0;
        nextK += 1;
      }
      // Behind schedule with a big fleet: let the sockets breathe, then carry on.
      if (now - started > 50) {
        timer = setTimeout(tick, 0);
        return;
      }
    }
    timer = setTimeout(tick, Math.max(0, dueOf(nextS, nextK) - Date.now()));
  };

  const onAbort = () => stopProducing("signal");
  if (hooks.signal?.aborted) onAbort();
  else hooks.signal?.addEventListener("abort", onAbort, { once: true });

  const snapshot = (): FleetProgress => {
    let online = 0;
    let dead = 0;
    const c = { sent: 0, acknowledged: 0, failed: 0, inFlight: 0, buffered: 0, overflow: 0, reconnects: 0, refused: 0 };
    for (const { device } of runs) {
      if (device.isDead) dead += 1;
      else if (device.online) online += 1;
      c.sent += device.counters.sent;
      c.acknowledged += device.counters.delivered;
      c.failed += device.counters.failed;
      c.inFlight += device.inFlight;
      c.buffered += device.buffered;
      c.overflow += device.counters.overflow;
      c.reconnects += device.counters.reconnects;
      c.refused += device.counters.refused;
    }
    return {
      elapsedMs: Date.now() - wallStart,
      simS,
      simClock: formatClock(world.hourOfDay(simS)),
      sensors: n,
      online,
      dead,
      samples: stats.samples,
      packs: stats.packs,
      readings: stats.readings,
      garbage: stats.garbage,
      dropouts: stats.dropouts,
      lagMs: stats.lagMs,
      ...c,
    };
  };

  const progressTimer =
    hooks.onProgress && (hooks.progressMs ?? 0) > 0
      ? setInterval(() => {
          hooks.onProgress?.(snapshot());
          stats.lagMs = 0;
        }, hooks.progressMs)
      : undefined;

  tick();
  await produced;

  // Wind down: send what is pending, wait for buffers and acknowledgements, then disconnect.
  for (const t of connectTimers) clearTimeout(t);
  for (const run of runs) if (!run.killed) flushPending(run);
  const drainMs = stoppedBy === "signal" ? config.signalDrainMs : config.drainMs;
  const drainUntil = Date.now() + drainMs;
  // A device whose connect timer never fired (a short run) still has to connect to deliver.
  for (const r of runs) r.device.start();
  while (Date.now() < drainUntil && !runs.every((r) => r.device.idle)) {
    await new Promise((resolve) => setTimeout(resolve, 25));
  }
  const final = snapshot();
  if (progressTimer) clearInterval(progressTimer);
  hooks.signal?.removeEventListener("abort", onAbort);
  await Promise.all(runs.map((r) => r.device.close()));

  const elapsedS = Math.max(0.001, final.elapsedMs / 1000);
  return {
    ...final,
    stoppedBy: stoppedBy ?? "signal",
    scenario: config.scenario,
    scenarioDescription: world.plan.description,
    seed: config.seed,
    qos: config.qos,
    unsent: final.buffered + final.inFlight,
    readingsPerSecond: final.readings / elapsedS,
  };
}
