import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import type { DataSource } from "typeorm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Quantity } from "../../../shared/schemas/quantities.js";
import { createDataSource, rawDatabase } from "../../db/data-source.js";
import { ReadingsRepository, type ReadingRow } from "./readings.repository.js";
import { bucketSizeMs } from "./readings.service.js";

let dir: string;
let ds: DataSource;
let repository: ReadingsRepository;
const QUANTITY: Quantity = "air.temperature";
const DAY_MS = 86_400_000;
const T0 = Date.UTC(2026, 0, 1);

/** The series straight from the readings: what the rollups must reproduce. */
function rawSeries(benchId: number, fromMs: number, toMs: number, bucketMs: number) {
  return rawDatabase(ds)
    .prepare(
      `SELECT CAST((time_ms - ?) / ? AS INTEGER) AS bucket, MIN(value) AS min, MAX(value) AS max, AVG(value) AS mean, COUNT(*) AS count
         FROM reading WHERE bench_id = ? AND quantity = ? AND time_ms >= ? AND time_ms < ? GROUP BY bucket ORDER BY bucket`,
    )
    .all(fromMs, bucketMs, benchId, QUANTITY, fromMs, toMs) as { bucket: number; min: number; max: number; mean: number; count: number }[];
}

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), "benchwarden-rollups-"));
  ds = createDataSource(join(dir, "db.sqlite"));
  await ds.initialize();
  await ds.runMigrations();
  repository = new ReadingsRepository(rawDatabase(ds));
  // Two sensors on bench 1 every 7 s for 8 days, in batches as ingest writes them; one on bench 2.
  const rows: ReadingRow[] = [];
  for (let t = T0; t < T0 + 8 * DAY_MS; t += 7000) {
    rows.push({ sensorId: "a", benchId: 1, quantity: QUANTITY, timeMs: t, value: 20 + Math.sin(t / 3.6e6) * 3 });
    rows.push({ sensorId: "b", benchId: 1, quantity: QUANTITY, timeMs: t + 3000, value: 21 + Math.cos(t / 1.8e6) });
    rows.push({ sensorId: "c", benchId: 2, quantity: QUANTITY, timeMs: t, value: 18 });
  }
  for (let i = 0; i < rows.length; i += 1000) repository.insertReadings(rows.slice(i, i + 1000));
  // A re-sent batch adds nothing to the rollups.
  repository.insertReadings(rows.slice(0, 1000));
});

afterAll(async () => {
  await ds.destroy();
  rmSync(dir, { recursive: true, force: true });
});

describe("series from rollups", () => {
  it("counts every reading of the range once, whatever the range and its alignment", () => {
    for (const [fromMs, toMs] of [
      [T0 + 12_345, T0 + DAY_MS + 12_345],
      [T0 + 1_000, T0 + 3 * DAY_MS - 1_000],
      [T0 + 3 * 3_600_000 + 59_999, T0 + 3 * 3_600_000 + 61_000],
      [T0 + 30_000, T0 + 45_000],
    ] as const) {
      const bucketMs = bucketSizeMs(toMs - fromMs);
      const points = repository.series(1, QUANTITY, fromMs, toMs, bucketMs);
      const raw = rawSeries(1, fromMs, toMs, bucketMs);
      expect(points.reduce((n, p) => n + p.count, 0)).toBe(raw.reduce((n, p) => n + p.count, 0));
      expect(Math.min(...points.map((p) => p.min))).toBeCloseTo(Math.min(...raw.map((p) => p.min)), 9);
      expect(Math.max(...points.map((p) => p.max))).toBeCloseTo(Math.max(...raw.map((p) => p.max)), 9);
      expect(points.length).toBeLessThanOrEqual(500);
    }
  });

  it("matches the readings bucket by bucket when buckets fall on the rollups' boundaries", () => {
    const fromMs = T0 + 3_600_000;
    const toMs = fromMs + 7 * DAY_MS;
    const bucketMs = bucketSizeMs(toMs - fromMs);
    expect(bucketMs).toBe(1_800_000); // read from the 15-minute rollups
    const points = repository.series(1, QUANTITY, fromMs, toMs, bucketMs);
    const raw = rawSeries(1, fromMs, toMs, bucketMs);
    expect(points.length).toBe(raw.length);
    points.forEach((p, i) => {
      expect(p.timeMs).toBe(fromMs + raw[i]!.bucket * bucketMs);
      expect(p.count).toBe(raw[i]!.count);
      expect(p.min).toBeCloseTo(raw[i]!.min, 9);
      expect(p.max).toBeCloseTo(raw[i]!.max, 9);
      expect(p.mean).toBeCloseTo(raw[i]!.mean, 9);
    });
  });

  it("when readings are re-filed to another bench (a back-dated move), then both benches' series follow", () => {
    const atMs = T0 + 2 * DAY_MS + 1234;
    rawDatabase(ds).prepare(`UPDATE reading SET bench_id = 2 WHERE sensor_id = 'b' AND time_ms >= ?`).run(atMs);
    for (const benchId of [1, 2]) {
      const fromMs = T0;
      const toMs = T0 + 8 * DAY_MS;
      const bucketMs = bucketSizeMs(toMs - fromMs);
      const points = repository.series(benchId, QUANTITY, fromMs, toMs, bucketMs);
      const raw = rawSeries(benchId, fromMs, toMs, bucketMs);
      expect(points.map((p) => p.count)).toEqual(raw.map((p) => p.count));
      points.forEach((p, i) => expect(p.max).toBeCloseTo(raw[i]!.max, 9));
    }
  });
});

describe("series of several benches at once (a zone's chart)", () => {
  const ranges = [
    [T0 + 12_345, T0 + DAY_MS + 12_345],
    [T0 + 3_600_000, T0 + 7 * DAY_MS + 3_600_000],
    [T0 + 1_000, T0 + 8 * DAY_MS - 1_000],
    [T0 + 30_000, T0 + 45_000],
  ] as const;

  it("gives each bench exactly the series that bench's own query gives, on one bucket grid", () => {
    for (const [fromMs, toMs] of ranges) {
      const bucketMs = bucketSizeMs(toMs - fromMs);
      const all = repository.seriesOfBenches([1, 2, 3], [QUANTITY, "air.humidity"], fromMs, toMs, bucketMs);
      for (const benchId of [1, 2]) {
        const own = repository.series(benchId, QUANTITY, fromMs, toMs, bucketMs);
        expect(own.length).toBeGreaterThan(0);
        const together = all.get(benchId)?.get(QUANTITY) ?? [];
        expect(together.map((p) => [p.timeMs, p.count])).toEqual(own.map((p) => [p.timeMs, p.count]));
        together.forEach((p, i) => {
          expect(p.min).toBeCloseTo(own[i]!.min, 9);
          expect(p.mean).toBeCloseTo(own[i]!.mean, 9);
          expect(p.max).toBeCloseTo(own[i]!.max, 9);
        });
        expect(together.length).toBeLessThanOrEqual(500);
      }
      // Nothing stored for bench 3 or for humidity: absent, not empty lists.
      expect(all.has(3)).toBe(false);
      expect(all.get(1)?.has("air.humidity")).toBe(false);
    }
    expect(repository.seriesOfBenches([], [QUANTITY], T0, T0 + DAY_MS, 180_000).size).toBe(0);
  });

  it("reads through the rollups' primary key and the readings' (bench, quantity, time) index, never a scan of either table", () => {
    const fromMs = T0 + 1_000;
    const toMs = T0 + 7 * DAY_MS + 1_000;
    const plan = repository.seriesOfBenchesPlan([1, 2], [QUANTITY], fromMs, toMs, bucketSizeMs(toMs - fromMs));
    // Every table is reached by a search on a key; the only scans are of the id lists and the union.
    expect(plan.filter((d) => d.startsWith("SCAN")).every((d) => /^SCAN (json_each VIRTUAL TABLE|\(subquery-\d+\))/.test(d))).toBe(true);
    expect(plan.filter((d) => /^SEARCH \S+ USING/.test(d)).every((d) => /USING (COVERING )?INDEX idx_reading_bench_quantity_time \(bench_id=\? AND quantity=\?|USING PRIMARY KEY \(bench_id=\? AND quantity=\? AND resolution_ms=\?/.test(d))).toBe(true);
    // The middle of the range from the rollups (1-minute edges, coarse middle), the partial minutes at the ends from the readings.
    expect(plan.filter((d) => d === "SEARCH reading_rollup USING PRIMARY KEY (bench_id=? AND quantity=? AND resolution_ms=? AND start_ms>? AND start_ms<?)")).toHaveLength(3);
    expect(plan.filter((d) => /^SEARCH \S+ USING INDEX idx_reading_bench_quantity_time \(bench_id=\? AND quantity=\? AND time_ms>\? AND time_ms<\?\)$/.test(d)).length).toBeGreaterThanOrEqual(2);
  });
});
