import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import type { DataSource } from "typeorm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Quantity } from "../../shared/schemas/quantities.js";
import type { SeriesPoint } from "../../shared/schemas/readings.js";
import { createDataSource, postgresPool, rawDatabase } from "../../server/db/data-source.js";
import { createLogger } from "../../server/lib/logger.js";
import { Metrics } from "../../server/lib/metrics.js";
import { PostgresReadingsRepository } from "../../server/modules/readings/postgres-readings.repository.js";
import { ReadingWriter } from "../../server/modules/readings/reading-writer.js";
import { createReadingStore } from "../../server/modules/readings/reading-store.js";
import { ReadingsRepository, type ReadingRow } from "../../server/modules/readings/readings.repository.js";
import { bucketSizeMs } from "../../server/modules/readings/readings.service.js";
import { startPostgres, type Postgres } from "../support/postgres.js";

let server: Postgres;
const open: DataSource[] = [];
const QUANTITY: Quantity = "air.temperature";
const MINUTE_MS = 60_000;
const HOUR_MS = 3_600_000;
const DAY_MS = 86_400_000;
const T0 = Date.UTC(2026, 0, 1);

async function postgresDatabase(): Promise<DataSource> {
  const ds = createDataSource({ kind: "postgres", url: await server.createDatabase() });
  await ds.initialize();
  open.push(ds);
  await ds.runMigrations({ transaction: "each" });
  return ds;
}

/** The series straight from the readings: what the rollups must reproduce. */
async function rawSeries(ds: DataSource, benchId: number, fromMs: number, toMs: number, bucketMs: number) {
  return (await ds.query(
    `SELECT (time_ms - $1::bigint) / $2::bigint AS bucket, MIN(value) AS min, MAX(value) AS max, AVG(value) AS mean, COUNT(*) AS count
       FROM reading WHERE bench_id = $3 AND quantity = $4 AND time_ms >= $1 AND time_ms < $5 GROUP BY 1 ORDER BY 1`,
    [fromMs, bucketMs, benchId, QUANTITY, toMs],
  )) as { bucket: number; min: number; max: number; mean: number; count: number }[];
}

function expectSameSeries(actual: SeriesPoint[], expected: SeriesPoint[]): void {
  expect(actual.map((p) => [p.timeMs, p.count, p.min, p.max])).toEqual(expected.map((p) => [p.timeMs, p.count, p.min, p.max]));
  actual.forEach((p, i) => expect(p.mean).toBeCloseTo(expected[i]!.mean, 9));
}

beforeAll(async () => {
  server = await startPostgres();
}, 120_000);

afterAll(async () => {
  for (const ds of open) if (ds.isInitialized) await ds.destroy();
  await server?.cleanup();
});

describe("readings on PostgreSQL", () => {
  let ds: DataSource;
  let repository: PostgresReadingsRepository;

  beforeAll(async () => {
    ds = await postgresDatabase();
    repository = new PostgresReadingsRepository(postgresPool(ds));
    // Two sensors on bench 1 every 7 s for 8 days, in batches as ingest writes them; one on bench 2.
    const rows: ReadingRow[] = [];
    for (let t = T0; t < T0 + 8 * DAY_MS; t += 7000) {
      rows.push({ sensorId: "a", benchId: 1, quantity: QUANTITY, timeMs: t, value: 20 + Math.sin(t / 3.6e6) * 3 });
      rows.push({ sensorId: "b", benchId: 1, quantity: QUANTITY, timeMs: t + 3000, value: 21 + Math.cos(t / 1.8e6) });
      rows.push({ sensorId: "c", benchId: 2, quantity: QUANTITY, timeMs: t, value: 18 });
    }
    for (let i = 0; i < rows.length; i += 1000) await repository.insertReadings(rows.slice(i, i + 1000));
    // A re-sent batch stores nothing and adds nothing to the rollups.
    expect(await repository.insertReadings(rows.slice(0, 1000))).toEqual([]);
    await ds.query("ANALYZE");
  }, 120_000);

  it("counts every reading of the range once, whatever the range and its alignment", async () => {
    for (const [fromMs, toMs] of [
      [T0 + 12_345, T0 + DAY_MS + 12_345],
      [T0 + 1_000, T0 + 3 * DAY_MS - 1_000],
      [T0 + 3 * HOUR_MS + 59_999, T0 + 3 * HOUR_MS + 61_000],
      [T0 + 30_000, T0 + 45_000],
    ] as const) {
      const bucketMs = bucketSizeMs(toMs - fromMs);
      const points = await repository.series(1, QUANTITY, fromMs, toMs, bucketMs);
      const raw = await rawSeries(ds, 1, fromMs, toMs, bucketMs);
      expect(points.reduce((n, p) => n + p.count, 0)).toBe(raw.reduce((n, p) => n + p.count, 0));
      expect(Math.min(...points.map((p) => p.min))).toBeCloseTo(Math.min(...raw.map((p) => p.min)), 9);
      expect(Math.max(...points.map((p) => p.max))).toBeCloseTo(Math.max(...raw.map((p) => p.max)), 9);
      expect(points.length).toBeLessThanOrEqual(500);
    }
  });

  it("matches the readings bucket by bucket when buckets fall on the rollups' boundaries", async () => {
    const fromMs = T0 + HOUR_MS;
    const toMs = fromMs + 7 * DAY_MS;
    const bucketMs = bucketSizeMs(toMs - fromMs);
    expect(bucketMs).toBe(1_800_000); // read from the 15-minute rollups
    const points = await repository.series(1, QUANTITY, fromMs, toMs, bucketMs);
    const raw = await rawSeries(ds, 1, fromMs, toMs, bucketMs);
    expect(points.length).toBe(raw.length);
    points.forEach((p, i) => {
      expect(p.timeMs).toBe(fromMs + raw[i]!.bucket * bucketMs);
      expect(p.count).toBe(raw[i]!.count);
      expect(p.min).toBeCloseTo(raw[i]!.min, 9);
      expect(p.max).toBeCloseTo(raw[i]!.max, 9);
      expect(p.mean).toBeCloseTo(raw[i]!.mean, 9);
    });
  });

  it("when a reading is sent again, alone or twice in one batch, then it is stored once and only the new rows come back, in the order given", async () => {
    const count = async () => Number(((await ds.query(`SELECT COUNT(*) AS n FROM reading`)) as { n: number }[])[0]!.n);
    const rolled = async () => Number(((await ds.query(`SELECT SUM(count) AS n FROM reading_rollup WHERE resolution_ms = ${MINUTE_MS}`)) as { n: number }[])[0]!.n);
    const before = { rows: await count(), rolled: await rolled() };
    const old: ReadingRow = { sensorId: "a", benchId: 1, quantity: QUANTITY, timeMs: T0, value: 99 };
    const first: ReadingRow = { sensorId: "z", benchId: 1, quantity: QUANTITY, timeMs: T0 - DAY_MS + 500, value: 5 };
    const second: ReadingRow = { sensorId: "y", benchId: 1, quantity: QUANTITY, timeMs: T0 - DAY_MS + 100, value: 6 };
    const stored = await repository.insertReadings([first, old, second, { ...first, value: 7 }]);
    expect(stored).toEqual([first, second]);
    expect(await count()).toBe(before.rows + 2);
    expect(await rolled()).toBe(before.rolled + 2);
    expect(await repository.insertReadings([second, first])).toEqual([]);
    expect(await count()).toBe(before.rows + 2);
    expect(await rolled()).toBe(before.rolled + 2);
    const [kept] = (await ds.query(`SELECT value FROM reading WHERE sensor_id = 'z'`)) as { value: number }[];
    expect(kept!.value).toBe(5); // the first of the two in the batch, as on SQLite
  });

  it("the latest reading only moves forward: an older or re-sent reading never replaces a newer one", async () => {
    const latestOfD = async () => (await repository.latestOnBenches()).filter((l) => l.sensorId === "d");
    const at = (timeMs: number, value: number): ReadingRow => ({ sensorId: "d", benchId: 9, quantity: QUANTITY, timeMs, value });
    await repository.insertReadings([at(T0 - 5 * DAY_MS, 10), at(T0 - 6 * DAY_MS, 11)]);
    expect(await latestOfD()).toEqual([{ sensorId: "d", benchId: 9, quantity: QUANTITY, timeMs: T0 - 5 * DAY_MS, value: 10 }]);
    await repository.insertReadings([at(T0 - 7 * DAY_MS, 12)]);
    expect((await latestOfD())[0]!.value).toBe(10);
    await repository.insertReadings([at(T0 - 4 * DAY_MS, 13), at(T0 - 5 * DAY_MS, 10)]);
    expect(await latestOfD()).toEqual([{ sensorId: "d", benchId: 9, quantity: QUANTITY, timeMs: T0 - 4 * DAY_MS, value: 13 }]);
    // A reading without a bench is stored but not on any bench's dashboard.
    await repository.insertReadings([{ sensorId: "e", benchId: null, quantity: QUANTITY, timeMs: T0 - 4 * DAY_MS, value: 1 }]);
    expect((await repository.latestOnBenches()).some((l) => l.sensorId === "e")).toBe(false);
  });

  it("when readings are re-filed to another bench (a back-dated move), then both benches' series follow", async () => {
    const atMs = T0 + 2 * DAY_MS + 1234;
    await ds.query(`UPDATE reading SET bench_id = 2 WHERE sensor_id = 'b' AND time_ms >= $1`, [atMs]);
    expect(Number(((await ds.query(`SELECT COUNT(*) AS n FROM reading_rollup_stale`)) as { n: number }[])[0]!.n)).toBeGreaterThan(0);
    for (const benchId of [1, 2]) {
      const fromMs = T0;
      const toMs = T0 + 8 * DAY_MS;
      const bucketMs = bucketSizeMs(toMs - fromMs);
      const points = await repository.series(benchId, QUANTITY, fromMs, toMs, bucketMs);
      const raw = await rawSeries(ds, benchId, fromMs, toMs, bucketMs);
      expect(points.map((p) => p.count)).toEqual(raw.map((p) => p.count));
      points.forEach((p, i) => expect(p.max).toBeCloseTo(raw[i]!.max, 9));
    }
    expect(await ds.query(`SELECT * FROM reading_rollup_stale`)).toEqual([]);
  });

  it("gives each bench of several exactly the series that bench's own query gives, on one bucket grid", async () => {
    for (const [fromMs, toMs] of [
      [T0 + 12_345, T0 + DAY_MS + 12_345],
      [T0 + HOUR_MS, T0 + 7 * DAY_MS + HOUR_MS],
      [T0 + 1_000, T0 + 8 * DAY_MS - 1_000],
      [T0 + 30_000, T0 + 45_000],
    ] as const) {
      const bucketMs = bucketSizeMs(toMs - fromMs);
      const all = await repository.seriesOfBenches([1, 2, 3], [QUANTITY, "air.humidity"], fromMs, toMs, bucketMs);
      for (const benchId of [1, 2]) {
        const own = await repository.series(benchId, QUANTITY, fromMs, toMs, bucketMs);
        expect(own.length).toBeGreaterThan(0);
        expectSameSeries(all.get(benchId)?.get(QUANTITY) ?? [], own);
      }
      // Nothing stored for bench 3 or for humidity: absent, not empty lists.
      expect(all.has(3)).toBe(false);
      expect(all.get(1)?.has("air.humidity")).toBe(false);
    }
    expect((await repository.seriesOfBenches([], [QUANTITY], T0, T0 + DAY_MS, 180_000)).size).toBe(0);
  });

  it("reads several benches through the readings' (bench, quantity, time) index and the rollups' primary key, never a scan of either table", async () => {
    const fromMs = T0 + 1_000;
    const toMs = T0 + 7 * DAY_MS + 1_000;
    const plan = await repository.seriesOfBenchesPlan([1, 2], [QUANTITY], fromMs, toMs, bucketSizeMs(toMs - fromMs));
    const [{ indexname: rollupKey }] = (await ds.query(`SELECT indexname FROM pg_indexes WHERE tablename = 'reading_rollup' AND indexname LIKE 'PK%'`)) as [{ indexname: string }];
    const byIndex = (index: string) => plan.filter((line) => line.includes(`Index Scan using ${index} `) || line.includes(`Index Only Scan using ${index} `) || line.endsWith(`Bitmap Index Scan on ${index}`) || line.includes(`Bitmap Index Scan on ${index} `));
    expect(plan.filter((line) => /Seq Scan on reading/.test(line))).toEqual([]);
    // The partial minutes at the ends from the readings, the middle from the rollups (1-minute edges, coarse middle).
    expect(byIndex("idx_reading_bench_quantity_time").length).toBeGreaterThanOrEqual(2);
    expect(byIndex(`"${rollupKey}"`)).toHaveLength(3);
  });
});

describe("SQLite and PostgreSQL give the same answers for the same readings", () => {
  let dir: string;
  let sqliteDs: DataSource;
  let sqlite: ReadingsRepository;
  let ds: DataSource;
  let postgres: PostgresReadingsRepository;
  const QUANTITIES: Quantity[] = [QUANTITY, "air.humidity"];

  /** Both sides, each asked the same, must answer alike. */
  async function expectSameEverywhere(ranges: readonly (readonly [number, number])[]): Promise<void> {
    for (const [fromMs, toMs] of ranges) {
      const bucketMs = bucketSizeMs(toMs - fromMs);
      for (const benchId of [1, 2, 3]) {
        for (const quantity of QUANTITIES) {
          const expected = sqlite.series(benchId, quantity, fromMs, toMs, bucketMs);
          expectSameSeries(await postgres.series(benchId, quantity, fromMs, toMs, bucketMs), expected);
        }
      }
      const expected = sqlite.seriesOfBenches([1, 2, 3, 4], QUANTITIES, fromMs, toMs, bucketMs);
      const actual = await postgres.seriesOfBenches([1, 2, 3, 4], QUANTITIES, fromMs, toMs, bucketMs);
      expect([...actual.keys()].sort()).toEqual([...expected.keys()].sort());
      for (const [benchId, perQuantity] of expected) {
        expect([...actual.get(benchId)!.keys()].sort()).toEqual([...perQuantity.keys()].sort());
        for (const [quantity, points] of perQuantity) expectSameSeries(actual.get(benchId)!.get(quantity)!, points);
      }
    }
  }

  const RANGES = [
    [T0 + 12_345, T0 + DAY_MS + 12_345],
    [T0 - HOUR_MS, T0 + 2 * DAY_MS],
    [T0 + 5 * HOUR_MS + 7_777, T0 + 5 * HOUR_MS + 47 * MINUTE_MS + 1_234],
    [T0 + 30_000, T0 + 45_000],
    [T0 + 20 * MINUTE_MS + 30_000, T0 + 20 * MINUTE_MS + 50_000],
  ] as const;

  beforeAll(async () => {
    dir = mkdtempSync(join(tmpdir(), "benchwarden-parity-"));
    sqliteDs = createDataSource(join(dir, "db.sqlite"));
    await sqliteDs.initialize();
    open.push(sqliteDs);
    await sqliteDs.runMigrations();
    sqlite = new ReadingsRepository(rawDatabase(sqliteDs));
    ds = await postgresDatabase();
    postgres = new PostgresReadingsRepository(postgresPool(ds));

    // Six probes on three benches (one unassigned) at irregular times over two days, two
    // quantities, sent in batches of uneven size, some batches out of order and some twice.
    let seed = 7;
    const random = () => (seed = (seed * 16_807) % 2_147_483_647) / 2_147_483_647;
    const rows: ReadingRow[] = [];
    for (let probe = 0; probe < 6; probe++) {
      for (let t = T0 - 2 * HOUR_MS + Math.floor(random() * 9000); t < T0 + 2 * DAY_MS; t += 3000 + Math.floor(random() * 12_000)) {
        for (const quantity of QUANTITIES) {
          rows.push({ sensorId: `p${probe}`, benchId: probe === 5 ? null : (probe % 3) + 1, quantity, timeMs: t, value: Math.round((15 + random() * 10) * 1000) / 1000 + random() * 1e-6 });
        }
      }
    }
    rows.sort((a, b) => a.timeMs - b.timeMs);
    const batches: ReadingRow[][] = [];
    for (let i = 0; i < rows.length; ) {
      const size = 1 + Math.floor(random() * 1500);
      batches.push(rows.slice(i, i + size));
      i += size;
    }
    for (let i = 0; i + 1 < batches.length; i += 7) [batches[i], batches[i + 1]] = [batches[i + 1]!, batches[i]!];
    for (const [i, batch] of batches.entries()) {
      const again = i % 5 === 4 ? batches[i - 2]! : [];
      const offered = [...batch, ...again];
      const storedSqlite = sqlite.insertReadings(offered);
      const storedPostgres = await postgres.insertReadings(offered);
      expect(storedPostgres).toEqual(storedSqlite);
    }
  }, 120_000);

  afterAll(() => {
    rmSync(dir, { recursive: true, force: true });
  });

  it("the same series, series of several benches and latest readings", async () => {
    await expectSameEverywhere(RANGES);
    const order = (rows: { sensorId: string; quantity: string }[]) => [...rows].sort((a, b) => `${a.sensorId} ${a.quantity}`.localeCompare(`${b.sensorId} ${b.quantity}`));
    expect(order(await postgres.latestOnBenches())).toEqual(order(sqlite.latestOnBenches()));
  });

  it("the same once a range end's minute has lost its raw readings to retention (read from its 1-minute rollup)", async () => {
    // Retention deletes a minute's raw readings at once and keeps its rollups.
    const minuteMs = T0 + 20 * MINUTE_MS;
    const gone = `DELETE FROM reading WHERE bench_id = 1 AND time_ms >= ${minuteMs} AND time_ms < ${minuteMs + MINUTE_MS}`;
    expect(rawDatabase(sqliteDs).prepare(gone).run().changes).toBeGreaterThan(0);
    await ds.query(gone);
    await expectSameEverywhere(RANGES);
    // The range inside that minute still counts its readings, from the rollup.
    const inside = await postgres.series(1, QUANTITY, minuteMs + 30_000, minuteMs + 50_000, MINUTE_MS);
    expect(inside.reduce((n, p) => n + p.count, 0)).toBeGreaterThan(0);
  });

  it("the same after a back-dated probe move re-files readings and the stale hours are rebuilt", async () => {
    const refile = `UPDATE reading SET bench_id = 3 WHERE sensor_id = 'p0' AND time_ms >= ${T0 + 3 * HOUR_MS + 1234}`;
    rawDatabase(sqliteDs).prepare(refile).run();
    await ds.query(refile);
    await expectSameEverywhere(RANGES);
  });
});

describe("several instances writing at once", () => {
  it("when a probe move is still being committed while stale hours are rebuilt, then the rebuild waits for it rather than lose it", async () => {
    const ds = await postgresDatabase();
    const repository = new PostgresReadingsRepository(postgresPool(ds));
    const rows: ReadingRow[] = [];
    for (let t = T0; t < T0 + HOUR_MS; t += 10_000) {
      rows.push({ sensorId: "r1", benchId: 1, quantity: QUANTITY, timeMs: t, value: 20 + t / HOUR_MS / 1e6 });
      rows.push({ sensorId: "r2", benchId: 1, quantity: QUANTITY, timeMs: t + 1, value: 30 });
    }
    await repository.insertReadings(rows);
    await ds.query(`UPDATE reading SET bench_id = 2 WHERE sensor_id = 'r1'`); // the hour is marked stale on both benches
    // Another instance moves r2's first half hour too and has not committed yet: its trigger
    // finds the hour already marked and marks nothing new.
    const other = await postgresPool(ds).connect();
    try {
      await other.query("BEGIN");
      await other.query(`UPDATE reading SET bench_id = 2 WHERE sensor_id = 'r2' AND time_ms < $1`, [T0 + HOUR_MS / 2]);
      const rebuilt = repository.refreshStaleRollups();
      await new Promise((r) => setTimeout(r, 300));
      await other.query("COMMIT");
      await rebuilt;
    } finally {
      other.release();
    }
    for (const benchId of [1, 2]) {
      const raw = await rawSeries(ds, benchId, T0, T0 + HOUR_MS, MINUTE_MS);
      const points = await repository.series(benchId, QUANTITY, T0, T0 + HOUR_MS, MINUTE_MS);
      expect(points.map((p) => [p.timeMs, p.count, p.min, p.max])).toEqual(raw.map((r) => [T0 + r.bucket * MINUTE_MS, r.count, r.min, r.max]));
    }
  });

  it("when two instances store overlapping batches and rebuild re-filed hours at the same time, then every reading is stored once, nothing deadlocks and the series match the readings", async () => {
    const first = await postgresDatabase();
    const url = (first.options as { url: string }).url;
    const second = createDataSource({ kind: "postgres", url });
    await second.initialize();
    open.push(second);
    const a = new PostgresReadingsRepository(postgresPool(first));
    const b = new PostgresReadingsRepository(postgresPool(second));

    // 24 probes on 4 benches, a reading every 5 s for 2 hours; each instance is sent every reading
    // (the broker deals one message to both after a reconnect), in a different order of batches.
    const rows: ReadingRow[] = [];
    for (let t = T0; t < T0 + 2 * HOUR_MS; t += 5000) {
      for (let probe = 0; probe < 24; probe++) rows.push({ sensorId: `q${probe}`, benchId: (probe % 4) + 1, quantity: QUANTITY, timeMs: t + probe, value: 10 + probe + Math.sin(t / 1e6) });
    }
    const batches: ReadingRow[][] = [];
    for (let i = 0; i < rows.length; i += 500) batches.push(rows.slice(i, i + 500));
    const reordered = [...batches].reverse();

    let refiling = true;
    const rebuilds = (async () => {
      // Meanwhile probe q0's first hour moves to bench 2 and back, again and again, while both instances rebuild the stale hours.
      for (let round = 0; refiling; round++) {
        await Promise.all([
          first.query(`UPDATE reading SET bench_id = $1 WHERE sensor_id = 'q0' AND time_ms < $2`, [round % 2 === 0 ? 2 : 1, T0 + HOUR_MS]),
          a.refreshStaleRollups(),
          b.refreshStaleRollups(),
        ]);
      }
    })();
    const write = async (repository: PostgresReadingsRepository, list: ReadingRow[][]) => {
      let stored = 0;
      // Three batches in flight per instance, as several ingest paths would have.
      const queue = [...list];
      await Promise.all(
        [0, 1, 2].map(async () => {
          for (let batch = queue.shift(); batch; batch = queue.shift()) {
            const added = await repository.insertReadings(batch);
            stored += added.length;
          }
        }),
      );
      return stored;
    };
    let storedA: number, storedB: number;
    try {
      [storedA, storedB] = await Promise.all([write(a, batches), write(b, reordered)]);
    } finally {
      refiling = false;
      await rebuilds;
    }

    expect(storedA + storedB).toBe(rows.length);
    expect(Number(((await first.query(`SELECT COUNT(*) AS n FROM reading`)) as { n: number }[])[0]!.n)).toBe(rows.length);
    await a.refreshStaleRollups();
    for (const benchId of [1, 2, 3, 4]) {
      // Minute buckets on minute boundaries: rollups and readings agree bucket by bucket.
      const raw = await rawSeries(first, benchId, T0, T0 + 2 * HOUR_MS, MINUTE_MS);
      const points = await b.series(benchId, QUANTITY, T0, T0 + 2 * HOUR_MS, MINUTE_MS);
      expect(points.map((p) => [p.timeMs, p.count, p.min, p.max])).toEqual(raw.map((r) => [T0 + r.bucket * MINUTE_MS, r.count, r.min, r.max]));
      // Every tier of the rollups agrees with the readings.
      const tiers = (await first.query(`SELECT resolution_ms AS "resolutionMs", SUM(count) AS n FROM reading_rollup WHERE bench_id = $1 GROUP BY 1 ORDER BY 1`, [benchId])) as { resolutionMs: number; n: number }[];
      const [total] = (await first.query(`SELECT COUNT(*) AS n FROM reading WHERE bench_id = $1`, [benchId])) as { n: number }[];
      expect(tiers.map((t) => t.n)).toEqual([total!.n, total!.n, total!.n]);
    }
  }, 120_000);
});

describe("the reading writer on PostgreSQL", () => {
  it("commits one batch at a time: rows arriving during a commit go together into the next, a refused batch fails the messages in it and the writer goes on, and close() commits what waits", async () => {
    const ds = await postgresDatabase();
    const store = createReadingStore(ds);
    expect(store).toBeInstanceOf(PostgresReadingsRepository);
    const metrics = new Metrics();
    const committed: number[] = [];
    const writer = new ReadingWriter(store, (rows) => committed.push(rows.length), metrics, createLogger("silent"));
    const row = (i: number, quantity: string = QUANTITY): ReadingRow => ({ sensorId: `w${i % 10}`, benchId: 1, quantity: quantity as Quantity, timeMs: T0 + i, value: i });
    const stored = async () => Number(((await ds.query(`SELECT COUNT(*) AS n FROM reading`)) as { n: number }[])[0]!.n);

    const first = writer.enqueue([row(0)]);
    await new Promise((r) => setImmediate(r)); // its transaction is under way now
    const meanwhile = Array.from({ length: 50 }, (_, i) => writer.enqueue([row(i + 1)]));
    await first;
    expect(await stored()).toBeGreaterThanOrEqual(1);
    await Promise.all(meanwhile);
    expect(await stored()).toBe(51);
    expect(committed).toEqual([1, 50]);
    expect(metrics.writeBatches.get()).toBe(2);
    expect(metrics.readingsStored.get()).toBe(51);

    // Re-sent: acknowledged, counted as duplicates, nothing new announced.
    await writer.enqueue([row(1), row(2)]);
    expect(metrics.readingsDuplicate.get()).toBe(2);
    expect(committed).toEqual([1, 50]);

    // A batch the database refuses (a quantity longer than its column) fails its messages; the writer goes on.
    const refused = writer.enqueue([row(100, "q".repeat(40))]);
    const alongside = writer.enqueue([row(101)]);
    await expect(refused).rejects.toThrow();
    await expect(alongside).rejects.toThrow();
    await writer.enqueue([row(102)]);
    expect(await stored()).toBe(52);

    // Waiting for the end of the turn when close() comes: committed before close() resolves.
    const waiting = writer.enqueue([row(103), row(104)]);
    await writer.close();
    expect(await stored()).toBe(54);
    await waiting;
    await expect(writer.enqueue([row(105)])).rejects.toThrow(/closed/);
  });
});
