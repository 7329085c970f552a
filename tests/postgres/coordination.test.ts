import pg from "pg";
import type { DataSource } from "typeorm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { PostgresEventBus, type ClusterEvent } from "../../server/coordination/event-bus.js";
import { Lease } from "../../server/coordination/lease.js";
import { createDataSource, postgresPool } from "../../server/db/data-source.js";
import { createLogger } from "../../server/lib/logger.js";
import { startPostgres, type Postgres } from "../support/postgres.js";

const logger = createLogger("silent");

async function until(condition: () => boolean, timeoutMs: number): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (!condition()) {
    if (Date.now() > deadline) throw new Error(`condition not met within ${timeoutMs} ms`);
    await new Promise((r) => setTimeout(r, 20));
  }
}
let server: Postgres;
let url: string;
const opened: DataSource[] = [];

async function open(): Promise<DataSource> {
  const ds = createDataSource({ kind: "postgres", url });
  await ds.initialize();
  opened.push(ds);
  return ds;
}

beforeAll(async () => {
  server = await startPostgres();
  url = await server.createDatabase();
  const ds = await open();
  await ds.runMigrations({ transaction: "each" });
}, 120_000);

afterAll(async () => {
  for (const ds of opened) if (ds.isInitialized) await ds.destroy().catch(() => undefined);
  await server?.cleanup();
});

describe("the alert engine's lease on PostgreSQL", () => {
  it("is held by one instance at a time, and taken over within ttl + one renewal after its holder is cut off", async () => {
    const ttlMs = 2000;
    const renewEveryMs = 400;
    const events: string[] = [];
    const make = (holder: string, ds: DataSource) =>
      new Lease(ds, { name: "takeover-test", holder, ttlMs, renewEveryMs }, logger, async () => void events.push(`${holder} took`), async () => void events.push(`${holder} lost`));
    const first = make("first", await open());
    const secondSource = await open();
    const second = make("second", secondSource);
    await first.start();
    await second.start();
    expect(first.isHeld()).toBe(true);
    expect(second.isHeld()).toBe(false);
    await new Promise((r) => setTimeout(r, 3 * renewEveryMs));
    expect(second.isHeld()).toBe(false); // renewals keep it with the first
    expect(events).toEqual(["first took"]);

    // The first instance's database connections die (as when its machine dies): it stops renewing.
    const firstSource = opened[opened.length - 2]!;
    const cutAtMs = Date.now();
    await firstSource.destroy();
    await until(() => second.isHeld(), 10_000);
    const takeoverMs = Date.now() - cutAtMs;
    expect(takeoverMs).toBeLessThanOrEqual(ttlMs + 2 * renewEveryMs + 500);
    // The cut-off holder stepped down by itself before the lease could pass to the other.
    expect(first.isHeld()).toBe(false);
    expect(events.indexOf("first lost")).toBeGreaterThan(-1);
    expect(events.indexOf("first lost")).toBeLessThan(events.indexOf("second took"));
    await second.stop();
    await first.stop();
  }, 30_000);

  it("a holder that stops releases the lease: the other takes over at its next renewal", async () => {
    const make = async (holder: string) => new Lease(await open(), { name: "release-test", holder, ttlMs: 60_000, renewEveryMs: 300 }, logger, async () => {}, async () => {});
    const first = await make("first");
    const second = await make("second");
    await first.start();
    await second.start();
    expect(second.isHeld()).toBe(false);
    await first.stop();
    await until(() => second.isHeld(), 5000);
    await second.stop();
  });
});

describe("events between instances (LISTEN/NOTIFY)", () => {
  it("every instance, the sender too, receives each event; a large batch of readings arrives whole", async () => {
    const a = await open();
    const b = await open();
    const busA = new PostgresEventBus(postgresPool(a), url, logger);
    const busB = new PostgresEventBus(postgresPool(b), url, logger);
    await busA.start();
    await busB.start();
    const seenA: ClusterEvent[] = [];
    const seenB: ClusterEvent[] = [];
    busA.subscribe((e) => seenA.push(e));
    busB.subscribe((e) => seenB.push(e));
    const rows = Array.from({ length: 2000 }, (_, i) => ({ sensorId: `probe-${i % 50}`, benchId: i % 10, quantity: "air.temperature" as const, timeMs: 1_796_329_492_887 + i, value: i / 3 }));
    busA.publish({ type: "readings", rows });
    busA.publish({ type: "alerts", alertIds: [7] });
    const readingsOf = (seen: ClusterEvent[]) => seen.flatMap((e) => (e.type === "readings" ? e.rows : []));
    await until(() => readingsOf(seenB).length === rows.length && seenB.some((e) => e.type === "alerts"), 10_000);
    await until(() => readingsOf(seenA).length === rows.length, 10_000);
    expect(readingsOf(seenB)).toEqual(rows);
    // Order is kept: the alert event comes after the whole batch.
    expect(seenB[seenB.length - 1]).toEqual({ type: "alerts", alertIds: [7] });
    // The sender handled its own events once, when published: their echo is dropped. Notifications
    // arrive in commit order, so once B's event reaches A, A's own echoes have arrived before it.
    busB.publish({ type: "windows" });
    await until(() => seenA.some((e) => e.type === "windows"), 5000);
    expect(readingsOf(seenA)).toEqual(rows);
    expect(seenA.filter((e) => e.type === "alerts")).toHaveLength(1);
    await busA.close();
    await busB.close();
  });

  it("after its listening connection is killed the bus reconnects, says resync, and receives again", async () => {
    const a = await open();
    const bus = new PostgresEventBus(postgresPool(a), url, logger);
    await bus.start();
    const seen: ClusterEvent[] = [];
    bus.subscribe((e) => seen.push(e));
    const admin = new pg.Client({ connectionString: url });
    await admin.connect();
    await admin.query(`SELECT pg_terminate_backend(pid) FROM pg_stat_activity WHERE application_name = 'benchwarden-listener' AND pid <> pg_backend_pid()`);
    await admin.end();
    await until(() => seen.some((e) => e.type === "resync"), 10_000);
    // Another instance's event (the bus's own go to its handlers without the listener).
    const other = new PostgresEventBus(postgresPool(await open()), url, logger);
    await other.start();
    other.publish({ type: "windows" });
    await until(() => seen.some((e) => e.type === "windows"), 5000);
    await other.close();
    await bus.close();
  });
});
