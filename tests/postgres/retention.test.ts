import pg from "pg";
import type { DataSource } from "typeorm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { QUANTITIES } from "../../shared/schemas/quantities.js";
import { BatchEntity, BatchPlacementEntity } from "../../server/db/entities/batch.entity.js";
import { createLogger } from "../../server/lib/logger.js";
import { Metrics } from "../../server/lib/metrics.js";
import { RETENTION_LOCK_KEY } from "../../server/modules/retention/retention.repository.js";
import { ReadingRetention, type RetentionRun } from "../../server/modules/retention/retention.service.js";
import { startPostgres, type Postgres } from "../support/postgres.js";
import { execute, insertReadings, nameOf, query, rollUp, roughly, seedLayout, twinDatabases, type TestReading, type TwinDatabases } from "../support/twin-databases.js";

/**
 * Raw-reading retention on PostgreSQL: the same rules as on SQLite (tests/integration/retention.test.ts)
 * — old hours go once their three rollup tiers hold every reading, hours with missing, short,
 * disagreeing or stale rollups stay, a batch's readings stay while it is open and for the retention
 * after it closes — in bounded chunks, each one transaction. Every scenario runs on both databases
 * with the same rows and must delete the same readings.
 */
const MINUTE_MS = 60_000;
const HOUR_MS = 3_600_000;
const DAY_MS = 24 * HOUR_MS;
const RETENTION_DAYS = 10;
const CHUNK_ROWS = 1000;
const MARGIN_MS = 20 * MINUTE_MS;
const NOW_MS = Date.UTC(2026, 2, 1, 12, 34);
const hourOf = (ms: number) => Math.floor(ms / HOUR_MS) * HOUR_MS;
const logger = createLogger("silent");

let server: Postgres;
let twins: TwinDatabases;
let benchIds: number[];

beforeAll(async () => {
  server = await startPostgres();
  twins = await twinDatabases(server);
  const layouts = await Promise.all(twins.both.map((ds) => seedLayout(ds, 6)));
  expect(layouts[1]).toEqual(layouts[0]);
  benchIds = layouts[0]!.benches.map((b) => b.id);
}, 120_000);

afterAll(async () => {
  await twins?.destroy();
  await server?.cleanup();
});

function retention(ds: DataSource): ReadingRetention {
  return new ReadingRetention(ds, { retentionDays: RETENTION_DAYS, chunkRows: CHUNK_ROWS, batchMarginMs: MARGIN_MS, now: () => NOW_MS }, new Metrics(), logger);
}

/** Air temperature every 20 s at :15, :35 and :55 of each minute, for `hours` hours from `startMs`. */
function airSeries(benchId: number, startMs: number, hours: number): TestReading[] {
  return Array.from({ length: hours * 180 }, (_, k) => ({
    sensorId: `probe-${benchId}`,
    quantity: "air.temperature",
    timeMs: startMs + 15_000 + k * 20_000,
    value: 22 + 2 * Math.sin(k / 7) + (k % 5) * 0.1,
    benchId,
  }));
}

/** The same readings, with their rollups, on both databases. */
async function store(rows: TestReading[]): Promise<void> {
  const fromMs = Math.min(...rows.map((r) => r.timeMs));
  const toMs = Math.max(...rows.map((r) => r.timeMs)) + 1;
  for (const ds of twins.both) {
    await insertReadings(ds, rows);
    await rollUp(ds, hourOf(fromMs), hourOf(toMs) + HOUR_MS);
  }
}

async function rawCount(ds: DataSource, benchId: number, fromMs: number, toMs: number): Promise<number> {
  return (await query<{ n: number }>(ds, "SELECT COUNT(*) AS n FROM reading WHERE bench_id = @benchId AND time_ms >= @fromMs AND time_ms < @toMs", { benchId, fromMs, toMs }))[0]!.n;
}

/** Raw counts of some hours of a bench, on each database. */
async function countsOf(benchId: number, hours: number[]): Promise<Record<string, number[]>> {
  const out: Record<string, number[]> = {};
  for (const ds of twins.both) out[nameOf(ds)] = await Promise.all(hours.map((h) => rawCount(ds, benchId, h, h + HOUR_MS)));
  return out;
}

/** One pass on each database; both must have done the same. */
async function passOnBoth(): Promise<RetentionRun> {
  const [onSqlite, onPostgres] = [await retention(twins.sqlite).run(), await retention(twins.postgres).run()];
  const figures = (r: RetentionRun) => ({ ...r, longestChunkMs: undefined, durationMs: undefined });
  expect(figures(onPostgres)).toEqual(figures(onSqlite));
  return onPostgres;
}

async function rollups(ds: DataSource, benchId: number): Promise<unknown[]> {
  return roughly(await query(ds, "SELECT quantity, resolution_ms, start_ms, min, max, sum, count FROM reading_rollup WHERE bench_id = @benchId ORDER BY quantity, resolution_ms, start_ms", { benchId }));
}

describe("raw-reading retention on PostgreSQL", () => {
  it("when old readings have their rollups, then a pass deletes them, keeps recent ones and leaves the rollups as they were", async () => {
    const benchId = benchIds[0]!;
    const old = hourOf(NOW_MS - 40 * DAY_MS);
    const recent = hourOf(NOW_MS - 2 * DAY_MS);
    await store([...airSeries(benchId, old, 3), ...airSeries(benchId, recent, 1)]);
    const hours = [old, old + HOUR_MS, old + 2 * HOUR_MS, recent];
    expect(await countsOf(benchId, hours)).toEqual({ sqlite: [180, 180, 180, 180], postgres: [180, 180, 180, 180] });
    const rollupsBefore = await rollups(twins.postgres, benchId);
    expect(rollupsBefore).toEqual(await rollups(twins.sqlite, benchId));

    const run = await passOnBoth();

    expect(run.cutoffMs).toBe(hourOf(NOW_MS - RETENTION_DAYS * DAY_MS));
    expect(run.deletedRows).toBe(540);
    expect(run.deletedHours).toBe(3);
    expect(await countsOf(benchId, hours)).toEqual({ sqlite: [0, 0, 0, 180], postgres: [0, 0, 0, 180] });
    expect(await rollups(twins.postgres, benchId)).toEqual(rollupsBefore);
    // Nothing left to do: a second pass deletes nothing.
    expect((await passOnBoth()).deletedRows).toBe(0);
  });

  it("when an hour's rollups are missing, short of its raw readings, disagree between tiers or are stale, then its readings are kept", async () => {
    const benchId = benchIds[1]!;
    const h = Array.from({ length: 5 }, (_, i) => hourOf(NOW_MS - 40 * DAY_MS) + i * HOUR_MS);
    await store(airSeries(benchId, h[0]!, 5));
    const key = { benchId, quantity: "air.temperature" };
    for (const ds of twins.both) {
      // h1: one minute's 1-minute rollup is missing.
      expect(await execute(ds, "DELETE FROM reading_rollup WHERE bench_id = @benchId AND quantity = @quantity AND resolution_ms = 60000 AND start_ms = @m", { ...key, m: h[1]! + 7 * MINUTE_MS })).toBe(1);
      // h2: marked stale (a back-dated move re-filed readings; the rollups wait for a rebuild).
      await execute(ds, "INSERT INTO reading_rollup_stale (bench_id, quantity, hour_ms) VALUES (@benchId, @quantity, @h)", { ...key, h: h[2]! });
      // h3: a reading written behind the ingest's back, without its rollups.
      await insertReadings(ds, [{ sensorId: `probe-${benchId}`, quantity: "air.temperature", timeMs: h[3]! + 5 * MINUTE_MS + 1_000, value: 23.5, benchId }]);
      // h4: the 1-hour rollup no longer agrees with the minutes.
      expect(await execute(ds, "UPDATE reading_rollup SET count = count - 1 WHERE bench_id = @benchId AND quantity = @quantity AND resolution_ms = 3600000 AND start_ms = @h", { ...key, h: h[4]! })).toBe(1);
    }
    expect(await countsOf(benchId, h)).toEqual({ sqlite: [180, 180, 180, 181, 180], postgres: [180, 180, 180, 181, 180] });

    const run = await passOnBoth();

    expect(await countsOf(benchId, h)).toEqual({ sqlite: [0, 180, 180, 181, 180], postgres: [0, 180, 180, 181, 180] });
    expect(run.keptForRollups).toBeGreaterThanOrEqual(4);
  });

  it("when a batch is on a bench, then its readings are kept while it is open and for the retention after it closes; readings outside its placements go", async () => {
    const [first, second] = [benchIds[2]!, benchIds[3]!];
    const movedAtMs = NOW_MS - 20 * DAY_MS;
    let batchId = 0;
    for (const ds of twins.both) {
      // Stuck 30 days ago on the first bench, moved to the second 20 days ago.
      const batch = await ds.getRepository(BatchEntity).save({
        variety: "Fig 'Retention Test'",
        stuckOn: new Date(NOW_MS - 30 * DAY_MS).toISOString().slice(0, 10),
        countStuck: 40,
        baseTreatments: "",
        benchId: second,
        createdAtMs: NOW_MS - 30 * DAY_MS,
        createdByName: "Test",
        updatedAtMs: movedAtMs,
      });
      batchId = batch.id;
      await ds.getRepository(BatchPlacementEntity).save([
        { batchId: batch.id, benchId: first, fromMs: NOW_MS - 30 * DAY_MS, toMs: movedAtMs },
        { batchId: batch.id, benchId: second, fromMs: movedAtMs, toMs: null },
      ]);
    }
    const beforeBatch = hourOf(NOW_MS - 45 * DAY_MS);
    const duringFirst = hourOf(NOW_MS - 25 * DAY_MS);
    const afterLeaving = hourOf(NOW_MS - 15 * DAY_MS);
    const duringSecond = hourOf(NOW_MS - 12 * DAY_MS);
    await store([...airSeries(first, beforeBatch, 1), ...airSeries(first, duringFirst, 1), ...airSeries(first, afterLeaving, 1), ...airSeries(second, duringSecond, 1)]);
    const counts = async () => {
      const one = await countsOf(first, [beforeBatch, duringFirst, afterLeaving]);
      const two = await countsOf(second, [duringSecond]);
      return { sqlite: [...one.sqlite!, ...two.sqlite!], postgres: [...one.postgres!, ...two.postgres!] };
    };
    expect(await counts()).toEqual({ sqlite: [180, 180, 180, 180], postgres: [180, 180, 180, 180] });

    const openRun = await passOnBoth();
    expect(await counts()).toEqual({ sqlite: [0, 180, 0, 180], postgres: [0, 180, 0, 180] });
    expect(openRun.keptForBatches).toBeGreaterThanOrEqual(2);

    // Closed an hour ago: the report of its life still reads every reading.
    for (const ds of twins.both) await execute(ds, "UPDATE batch SET closed_at_ms = @closedAtMs, outcome = 'potted-on' WHERE id = @batchId", { closedAtMs: NOW_MS - HOUR_MS, batchId });
    await passOnBoth();
    expect(await counts()).toEqual({ sqlite: [0, 180, 0, 180], postgres: [0, 180, 0, 180] });

    // Closed longer ago than the retention: its readings go like any others.
    for (const ds of twins.both) await execute(ds, "UPDATE batch SET closed_at_ms = @closedAtMs WHERE id = @batchId", { closedAtMs: NOW_MS - (RETENTION_DAYS + 1) * DAY_MS, batchId });
    await passOnBoth();
    expect(await counts()).toEqual({ sqlite: [0, 0, 0, 0], postgres: [0, 0, 0, 0] });
  });

  it("deletes in transactions of at most READING_RETENTION_CHUNK_ROWS readings (an hour bigger than that in whole minutes), and other writers commit between them", async () => {
    const benchId = benchIds[4]!;
    const startMs = hourOf(NOW_MS - 30 * DAY_MS);
    // Five quantities every 5 s for 8⅓ hours (720 readings an hour each), then one hour of a
    // reading every second (3,600: more than a chunk).
    const perQuantity = 6000;
    const rows: TestReading[] = Array.from({ length: perQuantity }, (_, k) =>
      QUANTITIES.map((quantity) => ({ sensorId: `probe-${benchId}`, quantity, timeMs: startMs + 15_000 + k * 5_000, value: 20 + (k % 11), benchId })),
    ).flat();
    const denseHourMs = startMs + 10 * HOUR_MS;
    rows.push(...Array.from({ length: 3600 }, (_, k) => ({ sensorId: `probe-${benchId}`, quantity: "air.humidity", timeMs: denseHourMs + k * 1_000, value: 80, benchId })));
    await store(rows);
    const total = rows.length;
    const endMs = denseHourMs + HOUR_MS;

    // Another connection sees each committed chunk: it takes the chunks' advisory lock in turn with
    // the pass, so it counts between every two chunks. And it writes while the pass runs.
    const observer = new pg.Client({ connectionString: (twins.postgres.options as { url: string }).url });
    await observer.connect();
    const observe = async () => Number((await observer.query("SELECT COUNT(*) AS n FROM reading WHERE bench_id = $1 AND time_ms >= $2 AND time_ms < $3", [benchId, startMs, endMs])).rows[0].n);
    const seen = [await observe()];
    expect(seen[0]).toBe(total);
    let runEnded = false;
    const running = retention(twins.postgres)
      .run()
      .finally(() => (runEnded = true));
    let wroteDuringRun = false;
    while (!runEnded) {
      await observer.query("SELECT pg_advisory_lock($1)", [RETENTION_LOCK_KEY]);
      const n = await observe();
      await observer.query("SELECT pg_advisory_unlock($1)", [RETENTION_LOCK_KEY]);
      if (n !== seen.at(-1)) seen.push(n);
      if (n < total && !wroteDuringRun) {
        // A live reading committed between chunks, not after the pass.
        await observer.query(`INSERT INTO reading (sensor_id, quantity, time_ms, value, bench_id) VALUES ('live-probe', 'air.temperature', $1, 24, $2)`, [NOW_MS, benchId]);
        wroteDuringRun = !runEnded;
      }
    }
    const run = await running;
    seen.push(await observe());
    await observer.end();

    expect(seen.at(-1)).toBe(0);
    const drops = seen.slice(1).map((n, i) => seen[i]! - n);
    expect(Math.max(...drops)).toBeLessThanOrEqual(CHUNK_ROWS);
    expect(drops.filter((d) => d > 0).length).toBeGreaterThanOrEqual(Math.ceil(total / CHUNK_ROWS));
    expect(run.largestChunkRows).toBeLessThanOrEqual(CHUNK_ROWS);
    expect(run.chunks).toBeGreaterThanOrEqual(Math.ceil(total / CHUNK_ROWS));
    expect(wroteDuringRun).toBe(true);
    expect(await rawCount(twins.postgres, benchId, NOW_MS, NOW_MS + 1)).toBe(1);

    // SQLite, given the same rows, deletes them in the same chunks.
    const onSqlite = await retention(twins.sqlite).run();
    expect([onSqlite.deletedRows, onSqlite.chunks, onSqlite.largestChunkRows]).toEqual([run.deletedRows, run.chunks, run.largestChunkRows]);
    expect(await rawCount(twins.sqlite, benchId, startMs, endMs)).toBe(0);
  });

  it("when two instances run a pass at the same time, then they take turns chunk by chunk and every reading is deleted and counted once", async () => {
    const benchId = benchIds[5]!;
    const startMs = hourOf(NOW_MS - 20 * DAY_MS);
    const rows = Array.from({ length: 3000 }, (_, k) =>
      QUANTITIES.map((quantity) => ({ sensorId: `probe-${benchId}`, quantity, timeMs: startMs + 15_000 + k * 10_000, value: 21, benchId })),
    ).flat();
    for (const ds of [twins.postgres]) {
      await insertReadings(ds, rows);
      await rollUp(ds, startMs, startMs + 10 * HOUR_MS);
    }
    const other = await twins.openAnotherPostgres();

    const runs = await Promise.all([retention(twins.postgres).run(), retention(other).run()]);

    expect(await rawCount(twins.postgres, benchId, startMs, startMs + 10 * HOUR_MS)).toBe(0);
    expect(runs[0].deletedRows + runs[1].deletedRows).toBe(rows.length);
    expect(runs[0].deletedHours + runs[1].deletedHours).toBe(QUANTITIES.length * 9);
  });
});
