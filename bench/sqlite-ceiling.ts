/**
 * Ceiling (a): raw better-sqlite3 inserts into the readings table's real schema (the migrations
 * run on a scratch file, same pragmas as the server), one transaction per 1,000 rows, through one
 * prepared statement. Rows arrive as a fleet sends them: time by time, every sensor, five
 * quantities each (the order the server sees); key order is measured too, for reference.
 * Sensors sit on 12 benches, as in the product runs (the demo nursery's benches).
 */
const BENCHES = 12;
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { createDataSource, rawDatabase } from "../server/db/data-source.js";

const QUANTITIES = ["air.temperature", "air.humidity", "medium.temperature", "medium.moisture", "battery"];

export interface SqliteCeiling {
  rows: number;
  fleetOrderRowsPerS: number;
  keyOrderRowsPerS: number;
}

async function measure(sensors: number, rows: number, order: "fleet" | "key"): Promise<number> {
  const dir = mkdtempSync(join(tmpdir(), "benchwarden-sqlite-ceiling-"));
  const ds = createDataSource(join(dir, "db.sqlite"));
  try {
    await ds.initialize();
    await ds.runMigrations();
    const db = rawDatabase(ds);
    const insert = db.prepare(
      `INSERT INTO reading (sensor_id, quantity, time_ms, value, bench_id) VALUES (?, ?, ?, ?, ?) ON CONFLICT DO NOTHING`,
    );
    const ids = Array.from({ length: sensors }, (_, i) => `load-${i}`);
    const ticks = Math.ceil(rows / (sensors * QUANTITIES.length));
    const t0 = Date.now() - ticks * 1000;
    const all: [string, string, number, number, number][] = [];
    if (order === "fleet") {
      for (let t = 0; t < ticks; t++) for (let s = 0; s < sensors; s++) for (const q of QUANTITIES) all.push([ids[s]!, q, t0 + t * 1000 + s, 20 + (s % 7), 1 + (s % BENCHES)]);
    } else {
      for (let s = 0; s < sensors; s++) for (const q of [...QUANTITIES].sort()) for (let t = 0; t < ticks; t++) all.push([ids[s]!, q, t0 + t * 1000 + s, 20 + (s % 7), 1 + (s % BENCHES)]);
    }
    all.length = Math.min(all.length, rows);
    const batch = db.transaction((chunk: typeof all) => {
      for (const r of chunk) insert.run(r);
    });
    const started = performance.now();
    for (let i = 0; i < all.length; i += 1000) batch(all.slice(i, i + 1000));
    return all.length / ((performance.now() - started) / 1000);
  } finally {
    await ds.destroy().catch(() => undefined);
    rmSync(dir, { recursive: true, force: true });
  }
}

export async function measureSqliteCeiling(rows: number, sensors = 5000): Promise<SqliteCeiling> {
  const fleet: number[] = [];
  for (let i = 0; i < 3; i++) fleet.push(await measure(sensors, rows, "fleet"));
  const key = await measure(sensors, rows, "key");
  fleet.sort((a, b) => a - b);
  return { rows, fleetOrderRowsPerS: Math.round(fleet[1]!), keyOrderRowsPerS: Math.round(key) };
}

if (process.argv[1]?.endsWith("sqlite-ceiling.ts")) {
  console.log(JSON.stringify(await measureSqliteCeiling(Number(process.argv[2] ?? 500_000))));
}
