/**
 * End-to-end throughput of the simulator on this machine: N sensors publishing to an open
 * broker in another process. `npx tsx --tsconfig tsconfig.server.json sensors-sim/bench/throughput.ts
 * [sensors=2000] [interval=1s] [duration=20s] [qos=1]`. Prints one line of results.
 */
import { spawn } from "node:child_process";
import { syntheticFleet } from "../credentials.js";
import { parseDuration } from "../duration.js";
import { runFleet } from "../fleet.js";

const sensors = Number(process.argv[2] ?? 2000);
const intervalMs = parseDuration(process.argv[3] ?? "1s");
const durationMs = parseDuration(process.argv[4] ?? "20s");
const qos = process.argv[5] === "0" ? 0 : 1;

const child = spawn(process.execPath, ["--import", "tsx", "sensors-sim/bench/broker.ts"], { stdio: ["ignore", "pipe", "inherit"] });
const lines: string[] = [];
let buffer = "";
child.stdout.on("data", (d: Buffer) => {
  buffer += d.toString();
  const parts = buffer.split("\n");
  buffer = parts.pop() ?? "";
  lines.push(...parts);
});
const waitFor = async (prefix: string): Promise<string> => {
  for (let i = 0; i < 400; i += 1) {
    const hit = lines.find((l) => l.startsWith(prefix));
    if (hit) {
      lines.splice(lines.indexOf(hit), 1);
      return hit;
    }
    await new Promise((r) => setTimeout(r, 25));
  }
  throw new Error(`broker did not say ${prefix}`);
};

const port = Number((await waitFor("port ")).split(" ")[1]);
const fleet = syntheticFleet(sensors);
let worstLag = 0;
const summary = await runFleet(
  {
    brokerUrl: `mqtt://127.0.0.1:${port}`,
    benches: fleet.benches,
    sensors: fleet.sensors,
    intervalMs,
    speed: 60,
    durationMs,
    scenario: "normal",
    seed: 1,
    qos,
    startHour: 12,
    batch: 1,
    bufferLimit: 720,
    affect: [],
    dropoutRate: 0,
    drainMs: 15_000,
    signalDrainMs: 1000,
    connectSpreadMs: Math.min(intervalMs, 3000),
  },
  { progressMs: 1000, onProgress: (p) => (worstLag = Math.max(worstLag, p.lagMs)) },
);
child.kill("SIGUSR2");
const [, messages] = (await waitFor("count ")).split(" ");
child.kill("SIGTERM");
const rss = Math.round(process.memoryUsage().rss / 1e6);
console.log(
  JSON.stringify({
    sensors,
    intervalMs,
    qos,
    seconds: summary.elapsedMs / 1000,
    packs: summary.packs,
    readings: summary.readings,
    readingsPerSecond: Math.round(summary.readingsPerSecond),
    packsPerSecond: Math.round(summary.packs / (summary.elapsedMs / 1000)),
    acknowledged: summary.acknowledged,
    unsent: summary.unsent,
    brokerReceived: Number(messages),
    worstLagMs: worstLag,
    rssMB: rss,
  }),
);
