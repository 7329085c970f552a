import { spawn } from "node:child_process";
import { mkdtemp, rm, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { buildProgram, defaultCredentialsPath, resolveRun, type CliOptions } from "./cli.js";
import type { SensorCredential } from "./credentials.js";
import { parseClock, parseDuration } from "./duration.js";
import { SCENARIO_NAMES } from "./model/scenarios.js";
import { startTestBroker } from "./testing/broker.js";

const CREDENTIALS: SensorCredential[] = [
  { id: "cli-a", secret: "sa", benchId: 7, benchName: "South 7", kind: "air" },
  { id: "cli-m", secret: "sm", benchId: 7, benchName: "South 7", kind: "medium" },
];

function parse(args: string[]): CliOptions {
  const program = buildProgram()
    .exitOverride()
    .configureOutput({ writeErr: () => undefined, writeOut: () => undefined });
  program.parse(args, { from: "user" });
  return program.opts<CliOptions>();
}

let dir: string;
let credentialsFile: string;
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), "sensors-sim-"));
  credentialsFile = join(dir, "demo-sensors.json");
  await writeFile(credentialsFile, JSON.stringify(CREDENTIALS));
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

describe("durations and clock times", () => {
  it("parses the units the options use", () => {
    expect(parseDuration("5s")).toBe(5000);
    expect(parseDuration("250ms")).toBe(250);
    expect(parseDuration("10m")).toBe(600_000);
    expect(parseDuration("1.5h")).toBe(5_400_000);
    expect(parseDuration("30")).toBe(30_000);
    expect(() => parseDuration("soon")).toThrow(/not a duration/);
    expect(parseClock("22:30")).toBe(22.5);
    expect(() => parseClock("25:00")).toThrow();
  });
});

describe("the command line", () => {
  it("has the defaults the demo relies on", () => {
    const o = parse([]);
    expect(o).toMatchObject({ broker: "mqtt://127.0.0.1:1883", interval: 5000, speed: 1, scenario: "normal", qos: 1, batch: 1 });
    expect(o.count).toBeUndefined();
    expect(o.duration).toBeUndefined();
  });

  it("reads every option", () => {
    const o = parse([
      "--broker", "mqtt://127.0.0.1:1999", "--credentials", "x.json", "--sensors", "40", "--interval", "2s",
      "--speed", "60", "--duration", "10m", "--count", "9", "--scenario", "heater-failure", "--seed", "12",
      "--qos", "0", "--start", "21:15", "--affect", "North 1, 3", "--batch", "4", "--buffer", "50",
      "--dropouts", "0", "--drain", "2s", "--progress", "0", "--json", "--quiet",
    ]);
    expect(o).toEqual({
      broker: "mqtt://127.0.0.1:1999", credentials: "x.json", sensors: 40, interval: 2000, speed: 60,
      duration: 600_000, count: 9, scenario: "heater-failure", seed: 12, qos: 0, start: 21.25,
      affect: ["North 1", "3"], batch: 4, buffer: 50, dropouts: 0, drain: 2000, progress: 0, json: true, quiet: true,
    });
  });

  it.each([
    [["--scenario", "meteor"]],
    [["--qos", "2"]],
    [["--count", "0"]],
    [["--speed", "-1"]],
    [["--interval", "often"]],
    [["--seed", "1.5"]],
    [["--dropouts", "2"]],
    [["--bogus"]],
  ])("refuses %j", (args) => {
    expect(() => parse(args)).toThrow();
  });

  it("lists the options and every scenario in --help", () => {
    const help = buildProgram().helpInformation() + "\n";
    let after = "";
    const program = buildProgram()
      .exitOverride()
      .configureOutput({ writeOut: (s) => (after += s), writeErr: () => undefined });
    expect(() => program.parse(["--help"], { from: "user" })).toThrow();
    for (const flag of ["--broker", "--credentials", "--sensors", "--interval", "--speed", "--duration", "--count", "--scenario", "--seed", "--qos"]) {
      expect(help).toContain(flag);
    }
    for (const name of SCENARIO_NAMES) expect(after).toMatch(new RegExp(`^  ${name} `, "m"));
  });

  it("resolves a run from a credentials file: benches, sensors, seed, the scenario's start time", async () => {
    const run = await resolveRun(parse(["--credentials", credentialsFile, "--scenario", "heater-failure", "--seed", "4"]), {});
    expect(run.config.benches).toEqual([{ id: "7", name: "South 7" }]);
    expect(run.config.sensors.map((s) => [s.id, s.secret, s.kind, s.bench])).toEqual([
      ["cli-a", "sa", "air", 0],
      ["cli-m", "sm", "medium", 0],
    ]);
    expect(run.config.seed).toBe(4);
    expect(run.config.startHour).toBe(22.5);
  });

  it("plays more sensors than the file lists by reusing its entries under new client ids", async () => {
    const run = await resolveRun(parse(["--credentials", credentialsFile, "--sensors", "5", "--seed", "1"]), {});
    expect(run.config.sensors.map((s) => s.clientId)).toEqual(["cli-a", "cli-m", "cli-a~1", "cli-m~1", "cli-a~2"]);
  });

  it("finds demo-sensors.json beside DATABASE_PATH, and without one plays made-up sensors", async () => {
    expect(defaultCredentialsPath({ DATABASE_PATH: join(dir, "bw.sqlite") })).toBe(credentialsFile);
    const found = await resolveRun(parse(["--seed", "1"]), { DATABASE_PATH: join(dir, "bw.sqlite") });
    expect(found.fleet.synthetic).toBe(false);
    const none = await resolveRun(parse(["--seed", "1", "--sensors", "3"]), { DATABASE_PATH: join(dir, "nowhere", "bw.sqlite") });
    expect(none.fleet.synthetic).toBe(true);
    expect(none.config.sensors.map((s) => s.id)).toEqual(["sim-0001", "sim-0002", "sim-0003"]);
  });

  it("says what is wrong with a bad credentials file", async () => {
    const bad = join(dir, "bad.json");
    await writeFile(bad, JSON.stringify([{ id: "x", secret: "y", benchId: 1, benchName: "B", kind: "leaf" }]));
    await expect(resolveRun(parse(["--credentials", bad]), {})).rejects.toThrow(/0\.kind/);
    await expect(resolveRun(parse(["--credentials", join(dir, "missing.json")]), {})).rejects.toThrow(/cannot read/);
  });
});

describe("the CLI as a process (npm run sim)", () => {
  const tsx = join(process.cwd(), "node_modules", ".bin", "tsx");
  const sim = (args: string[]) =>
    spawn(tsx, ["--tsconfig", "tsconfig.server.json", "sensors-sim/index.ts", ...args], {
      cwd: process.cwd(),
      stdio: ["ignore", "pipe", "pipe"],
    });
  const collect = (child: ReturnType<typeof sim>) => {
    const out = { stdout: "", stderr: "" };
    child.stdout?.on("data", (d: Buffer) => (out.stdout += d.toString()));
    child.stderr?.on("data", (d: Buffer) => (out.stderr += d.toString()));
    const exited = new Promise<number | null>((resolve) => child.on("exit", (code) => resolve(code)));
    return { out, exited };
  };

  it("when given --count, then it stops by itself and prints a summary", async () => {
    const broker = await startTestBroker(CREDENTIALS);
    try {
      const child = sim(["--broker", broker.url, "--credentials", credentialsFile, "--interval", "100ms", "--count", "3", "--seed", "2", "--dropouts", "0"]);
      const { out, exited } = collect(child);
      expect(await exited).toBe(0);
      expect(out.stdout).toMatch(/stopped by\s+count/);
      expect(out.stdout).toMatch(/acknowledged 6 \(QoS 1\)/);
      expect(broker.received.filter((r) => r.topic.endsWith("/readings"))).toHaveLength(6);
    } finally {
      await broker.close();
    }
  });

  it("when started as demo mode does and sent SIGTERM, then it disconnects cleanly and exits 0", async () => {
    const broker = await startTestBroker(CREDENTIALS);
    try {
      const child = sim(["--broker", broker.url, "--credentials", credentialsFile, "--interval", "100ms", "--progress", "200ms"]);
      const { out, exited } = collect(child);
      await expect.poll(() => broker.received.length, { timeout: 15_000, interval: 50 }).toBeGreaterThanOrEqual(4);
      await expect.poll(() => out.stderr, { timeout: 5000, interval: 50 }).toMatch(/sent \d+ {2}acked \d+/); // the progress line
      const signalledAt = Date.now();
      child.kill("SIGTERM");
      expect(await exited).toBe(0);
      expect(Date.now() - signalledAt).toBeLessThan(4000);
      expect(out.stdout).toMatch(/stopped by\s+signal/);
      expect(broker.received.filter((r) => r.topic.endsWith("/status"))).toEqual([]); // no last will
    } finally {
      await broker.close();
    }
  });

  it("when the credentials file is missing, then it exits 2 with a message", async () => {
    const { out, exited } = collect(sim(["--credentials", join(dir, "missing.json")]));
    expect(await exited).toBe(2);
    expect(out.stderr).toMatch(/cannot read credentials file/);
  });
});
