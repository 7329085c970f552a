import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { readingsExportQuerySchema } from "../../shared/schemas/exports.js";
import { AppError } from "../../server/lib/errors.js";
import { ExportsService } from "../../server/modules/exports/exports.service.js";
import { startPostgres, type Postgres } from "../support/postgres.js";
import { execute, insertReadings, rollUp, seedLayout, twinDatabases, type TestReading, type TwinDatabases } from "../support/twin-databases.js";

/**
 * CSV exports on PostgreSQL: the same readings and rollups on both databases give byte-identical
 * files, raw and rolled up, and the same refusal of a raw range retention has thinned.
 */
const MINUTE_MS = 60_000;
const DAY_MS = 24 * 3_600_000;
/** Fixed "now", so both services cut the same retention boundary. */
const NOW_MS = Date.UTC(2026, 2, 1, 12);
/** A whole 5 minutes, an hour before now. */
const T0_MS = NOW_MS - 3_600_000;
/** An hour 40 days back, older than any retention. */
const OLD_MS = Date.UTC(2026, 0, 20, 6);

let server: Postgres;
let twins: TwinDatabases;
let zoneId: number;
let benchIds: number[];

beforeAll(async () => {
  server = await startPostgres();
  twins = await twinDatabases(server);
  const layouts = await Promise.all(twins.both.map((ds) => seedLayout(ds, 3)));
  expect(layouts[1]).toEqual(layouts[0]);
  zoneId = layouts[0]!.zoneId;
  benchIds = layouts[0]!.benches.map((b) => b.id);
  const combined = "combo-3";
  const rows: TestReading[] = [0, 1, 2, 3, 4, 5].flatMap((i) => {
    const timeMs = T0_MS + i * MINUTE_MS;
    const benchId = benchIds[2]!;
    return [
      { sensorId: combined, quantity: "air.temperature", timeMs, value: 21 + i, benchId },
      { sensorId: combined, quantity: "air.humidity", timeMs, value: 80, benchId },
      { sensorId: combined, quantity: "medium.temperature", timeMs, value: 23, benchId },
      { sensorId: combined, quantity: "medium.moisture", timeMs, value: 0.4 + i * 0.01, benchId },
      { sensorId: combined, quantity: "battery", timeMs, value: 90, benchId },
    ];
  });
  rows.push({ sensorId: "air-1", quantity: "air.temperature", timeMs: T0_MS + 30_000, value: 19.5, benchId: benchIds[0]! });
  // Old readings every 20 s on the first bench; retention later deletes the first 10 minutes of them.
  for (let k = 0; k < 180; k++) rows.push({ sensorId: "air-1", quantity: "air.temperature", timeMs: OLD_MS + 15_000 + k * 20_000, value: 22 + (k % 9) * 0.25, benchId: benchIds[0]! });
  for (const ds of twins.both) {
    await insertReadings(ds, rows);
    await rollUp(ds);
  }
}, 120_000);

afterAll(async () => {
  await twins?.destroy();
  await server?.cleanup();
});

async function text(service: ExportsService, query: Record<string, string | number>): Promise<{ filename: string; text: string }> {
  const file = await service.readingsCsv(readingsExportQuerySchema.parse(query));
  let out = "";
  for await (const chunk of file.chunks) out += chunk;
  return { filename: file.filename, text: out };
}

/** The export from both databases: byte-identical; the PostgreSQL one's rows (header first). */
async function onBoth(query: Record<string, string | number>): Promise<string[][]> {
  const [fromSqlite, fromPostgres] = await Promise.all(twins.both.map((ds) => text(new ExportsService(ds, () => NOW_MS, { retentionDays: 10 }), query)));
  expect(fromPostgres).toEqual(fromSqlite);
  const lines = fromPostgres!.text.slice(1).split("\r\n");
  expect(lines.pop()).toBe("");
  return lines.map((l) => l.split(","));
}

const range = { from: T0_MS, to: T0_MS + 10 * MINUTE_MS };

describe("readings export on PostgreSQL", () => {
  it("raw, for a bench and for a zone, in °C or °F: the same file as on SQLite", async () => {
    const [header, ...rows] = await onBoth({ benchId: benchIds[2]!, ...range });
    expect(header!.slice(0, 5)).toEqual(["time (UTC)", "time (America/Chicago)", "zone", "bench", "sensor"]);
    expect(rows).toHaveLength(6);
    expect(rows[0]).toEqual([new Date(T0_MS).toISOString(), expect.any(String), "House 1", "Bench 3", "combo-3", "21", "80", "23", "0.4", "90"]);
    expect(rows[5]!.slice(5)).toEqual(["26", "80", "23", "0.45", "90"]);

    const [, ...converted] = await onBoth({ benchId: benchIds[2]!, ...range, temperatureUnit: "F", moistureUnit: "percent" });
    expect(converted[0]!.slice(5, 9)).toEqual(["69.8", "80", "73.4", "40"]);

    const [, ...zone] = await onBoth({ zoneId, ...range });
    expect(zone.map((r) => r[3])).toEqual(["Bench 3", "Bench 1", "Bench 3", "Bench 3", "Bench 3", "Bench 3", "Bench 3"]);
  });

  it("rolled up at 5 minutes and at 1 hour: mean, min, max and count per bucket, the same as on SQLite", async () => {
    const [header, ...rows] = await onBoth({ benchId: benchIds[2]!, ...range, interval: "5m" });
    expect(header).toHaveLength(4 + 5 * 4);
    expect(rows.map((r) => [r[0], ...r.slice(4, 8)])).toEqual([
      [new Date(T0_MS).toISOString(), "23", "21", "25", "5"],
      [new Date(T0_MS + 5 * MINUTE_MS).toISOString(), "26", "26", "26", "1"],
    ]);
    const [, ...hourly] = await onBoth({ zoneId, ...range, interval: "1h" });
    expect(hourly.map((r) => r[3])).toEqual(["Bench 1", "Bench 3"]);
    expect(hourly[1]!.slice(4, 8)).toEqual(["23.5", "21", "26", "6"]);
    // A 40-day range in hourly buckets: the old hour and the recent one.
    const [, ...long] = await onBoth({ benchId: benchIds[0]!, from: OLD_MS - DAY_MS, to: NOW_MS, interval: "1h" });
    expect(long.map((r) => [r[0], r[7]])).toEqual([
      [new Date(OLD_MS).toISOString(), "180"],
      [new Date(T0_MS).toISOString(), "1"],
    ]);
  });

  it("when retention has deleted raw readings of a range, then a raw export is refused on both and a 1-minute export is unchanged", async () => {
    const oldRange = { benchId: benchIds[0]!, from: OLD_MS, to: OLD_MS + 3_600_000 };
    const minutesBefore = await onBoth({ ...oldRange, interval: "1m" });
    expect((await onBoth({ ...oldRange, interval: "raw" })).length).toBe(1 + 180);

    for (const ds of twins.both) {
      expect(await execute(ds, "DELETE FROM reading WHERE bench_id = @benchId AND time_ms >= @fromMs AND time_ms < @toMs", { benchId: benchIds[0]!, fromMs: OLD_MS, toMs: OLD_MS + 10 * MINUTE_MS })).toBe(30);
    }
    const refusals = await Promise.all(
      twins.both.map((ds) =>
        new ExportsService(ds, () => NOW_MS, { retentionDays: 10 }).readingsCsv(readingsExportQuerySchema.parse({ ...oldRange, interval: "raw" })).then(
          () => null,
          (err: unknown) => err,
        ),
      ),
    );
    for (const refused of refusals) {
      expect(refused).toBeInstanceOf(AppError);
      expect(refused).toMatchObject({ code: "raw-readings-not-kept", status: 400 });
      expect((refused as AppError).message).toContain("kept for 10 days");
    }
    expect(await onBoth({ ...oldRange, interval: "1m" })).toEqual(minutesBefore);
    // The untouched later part of the hour still exports raw.
    expect((await onBoth({ ...oldRange, from: OLD_MS + 10 * MINUTE_MS, interval: "raw" })).length).toBe(1 + 150);
  });

  it("waits for an asynchronous rollup refresh before reading the rollups", async () => {
    const hourMs = T0_MS - 2 * 3_600_000;
    const query = readingsExportQuerySchema.parse({ benchId: benchIds[1]!, from: hourMs, to: hourMs + 3_600_000, interval: "15m" });
    await insertReadings(twins.postgres, [{ sensorId: "air-2", quantity: "air.temperature", timeMs: hourMs + 61_000, value: 18.25, benchId: benchIds[1]! }]);
    let refreshed = false;
    const service = new ExportsService(twins.postgres, () => NOW_MS, {
      refreshRollups: async () => {
        await new Promise((resolve) => setTimeout(resolve, 20));
        await rollUp(twins.postgres, hourMs, hourMs + 3_600_000);
        refreshed = true;
      },
    });
    const file = await service.readingsCsv(query);
    expect(refreshed).toBe(true);
    let out = "";
    for await (const chunk of file.chunks) out += chunk;
    const rows = out.trim().split("\r\n").slice(1);
    expect(rows.map((r) => r.split(",").slice(4, 8))).toEqual([["18.25", "18.25", "18.25", "1"]]);
  });
});
