import http from "node:http";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { problemSchema } from "../../shared/api-error.js";
import { benchReadingsResponseSchema } from "../../shared/schemas/readings.js";
import { readingsEventSchema } from "../../shared/schemas/stream.js";
import { zonesResponseSchema } from "../../shared/schemas/zones.js";
import pg from "pg";
import { isPostgres, rawDatabase } from "../../server/db/data-source.js";
import { connectSensor, signIn, startTestServer, type TestServer } from "../support/test-server.js";

let server: TestServer;
let token: string;

beforeAll(async () => {
  server = await startTestServer();
  token = await signIn(server, "viewer");
});

afterAll(async () => {
  await server.cleanup();
});

/**
 * The server's database stops answering: SQLite's handle is closed; a PostgreSQL database refuses
 * new connections and its open ones are ended. Returns what brings it back (so the server can stop).
 */
async function takeDatabaseDown(target: TestServer): Promise<() => Promise<void>> {
  if (!isPostgres(target.dataSource)) {
    rawDatabase(target.dataSource).close();
    return async () => {};
  }
  const url = new URL(target.databaseUrl!);
  const name = url.pathname.slice(1);
  url.pathname = "/postgres";
  const admin = new pg.Client({ connectionString: url.toString() });
  await admin.connect();
  await admin.query(`ALTER DATABASE "${name}" ALLOW_CONNECTIONS false`);
  await admin.query("SELECT pg_terminate_backend(pid) FROM pg_stat_activity WHERE datname = $1", [name]);
  return async () => {
    await admin.query(`ALTER DATABASE "${name}" ALLOW_CONNECTIONS true`);
    await admin.end();
  };
}

describe("HTTP API", () => {
  it("lists the demo nursery's three zones and twelve benches with their windows", async () => {
    const res = await request(server.baseUrl).get("/api/zones").auth(token, { type: "bearer" }).expect(200);
    const { zones } = zonesResponseSchema.parse(res.body);
    expect(zones).toHaveLength(3);
    expect(zones.flatMap((z) => z.benches)).toHaveLength(12);
    const bench = zones[0]!.benches[0]!;
    // 70–80 °F, the common-practice rooting band (REFERENCES.md §6), converted per NIST SP 811.
    const air = bench.windows.find((w) => w.quantity === "air.temperature")!;
    expect(air.min).toBeCloseTo(21.111, 3);
    expect(air.max).toBeCloseTo(26.667, 3);
    expect(bench.status).toBe("unknown");
  });

  it("returns a bench's series in time buckets with min, mean and max", async () => {
    const credential = server.credentials.find((c) => c.kind === "air")!;
    const client = await connectSensor(server, credential);
    const nowS = Math.floor(Date.now() / 1000);
    // Three readings in the same minute, one an hour earlier.
    const pack = [
      { bn: `${credential.id}:`, bt: nowS - 3600, n: "air.temperature", u: "Cel", v: 20 },
      { n: "air.temperature", u: "Cel", v: 22, t: 3540 },
      { n: "air.temperature", u: "Cel", v: 24, t: 3550 },
      { n: "air.temperature", u: "Cel", v: 26, t: 3560 },
    ];
    await client.publishAsync(`benchwarden/v1/sensors/${credential.id}/readings`, JSON.stringify(pack), { qos: 1 });
    await client.endAsync();

    const res = await request(server.baseUrl).get(`/api/benches/${credential.benchId}/readings`).auth(token, { type: "bearer" }).expect(200);
    const body = benchReadingsResponseSchema.parse(res.body);
    expect(body.toMs - body.fromMs).toBe(24 * 3600 * 1000);
    expect(body.series.map((s) => s.quantity)).toContain("medium.moisture");
    const air = body.series.find((s) => s.quantity === "air.temperature")!;
    expect(air.points.length).toBeLessThanOrEqual(500);
    expect(air.points.map((p) => p.count).reduce((a, b) => a + b, 0)).toBe(4);
    const last = air.points.at(-1)!;
    expect(last).toMatchObject({ min: 22, max: 26, mean: 24, count: 3 });
  });

  it("when the range is bad, then it answers 400 with problem details naming the field", async () => {
    const res = await request(server.baseUrl).get("/api/benches/1/readings?from=yesterday").auth(token, { type: "bearer" }).expect(400);
    expect(res.headers["content-type"]).toMatch(/application\/problem\+json/);
    const problem = problemSchema.parse(JSON.parse(res.text));
    expect(problem.code).toBe("invalid-input");
    expect(problem.errors?.[0]?.path).toBe("from");
  });

  it("when the bench does not exist, then it answers 404 bench-not-found", async () => {
    const res = await request(server.baseUrl).get("/api/benches/9999/readings").auth(token, { type: "bearer" }).expect(404);
    expect(problemSchema.parse(JSON.parse(res.text)).code).toBe("bench-not-found");
  });

  it("when an id is past 32 bits (no row can have it), then it answers 400 naming the field, on either database", async () => {
    // PostgreSQL's integer ids: compared with such a number, the query itself fails (it was a 500 there).
    for (const id of [2 ** 31, Number.MAX_SAFE_INTEGER]) {
      const res = await request(server.baseUrl).get(`/api/benches/${id}/readings`).auth(token, { type: "bearer" }).expect(400);
      expect(problemSchema.parse(JSON.parse(res.text)).errors?.[0]?.path).toBe("benchId");
      const alerts = await request(server.baseUrl).get(`/api/alerts?benchId=${id}`).auth(token, { type: "bearer" }).expect(400);
      expect(problemSchema.parse(JSON.parse(alerts.text)).errors?.[0]?.path).toBe("benchId");
    }
    await request(server.baseUrl).get(`/api/benches/${2 ** 31 - 1}/readings`).auth(token, { type: "bearer" }).expect(404);
  });

  it("when the API path is unknown, then it answers 404 problem details, not the app page", async () => {
    const res = await request(server.baseUrl).get("/api/nothing-here").auth(token, { type: "bearer" }).expect(404);
    expect(problemSchema.parse(JSON.parse(res.text)).code).toBe("route-not-found");
  });

  it("when a JSON body is malformed, then it answers 400 problem details", async () => {
    const res = await request(server.baseUrl).post("/api/session").set("Content-Type", "application/json").send("{oops").expect(400);
    expect(problemSchema.parse(JSON.parse(res.text)).code).toBe("entity-parse-failed");
  });

  it("serves /healthz and Prometheus /metrics", async () => {
    await request(server.baseUrl).get("/healthz").expect(200, { status: "ok", database: "ok", broker: "ok" });
    const res = await request(server.baseUrl).get("/metrics").expect(200);
    expect(res.headers["content-type"]).toMatch(/^text\/plain; version=0\.0\.4/);
    for (const name of ["benchwarden_readings_stored_total counter", "benchwarden_readings_rejected_total counter", "benchwarden_ingest_commit_seconds histogram", "benchwarden_alerts gauge", "benchwarden_outbox_waiting gauge", "benchwarden_sensors_silent gauge", "benchwarden_process_resident_memory_bytes gauge"]) {
      expect(res.text).toContain(`# TYPE ${name}`);
    }
  });

  it("/healthz fails when the broker is down", async () => {
    const other = await startTestServer();
    try {
      await other.mqtt.close();
      const res = await request(other.baseUrl).get("/healthz").expect(503);
      expect(res.body).toEqual({ status: "unavailable", database: "ok", broker: "not listening" });
    } finally {
      await other.cleanup();
    }
  });

  it("/healthz fails when the database is down", async () => {
    const other = await startTestServer();
    let bringBack = async () => {};
    try {
      bringBack = await takeDatabaseDown(other);
      const res = await request(other.baseUrl).get("/healthz").expect(503);
      expect(res.body).toEqual({ status: "unavailable", database: "not answering", broker: "ok" });
    } finally {
      await bringBack();
      await other.cleanup();
    }
  });

  it("gzips JSON answers for a client that accepts it", async () => {
    const res = await request(server.baseUrl).get("/api/zones").set("Authorization", `Bearer ${token}`).set("Accept-Encoding", "gzip").expect(200);
    expect(res.headers["content-encoding"]).toBe("gzip");
    expect(res.body).toHaveProperty("zones"); // supertest unzips
  });

  it("streams committed readings as server-sent events, uncompressed even for a client that accepts gzip", async () => {
    const credential = server.credentials.find((c) => c.kind === "medium")!;
    const received = new Promise<unknown>((resolve, reject) => {
      // The stream sends Cache-Control: no-transform, which keeps compression off it.
      const req = http.get(`${server.baseUrl}/api/stream`, { headers: { Authorization: `Bearer ${token}`, "Accept-Encoding": "gzip" } }, (res) => {
        expect(res.headers["content-type"]).toBe("text/event-stream");
        expect(res.headers["content-encoding"]).toBeUndefined();
        let buffer = "";
        res.on("data", (chunk: Buffer) => {
          buffer += chunk.toString();
          const match = /event: readings\ndata: (.*)\n\n/.exec(buffer);
          if (match) {
            req.destroy();
            resolve(JSON.parse(match[1]!));
          }
        });
      });
      req.on("error", reject);
      setTimeout(() => reject(new Error("no readings event within 3 s")), 3000);
    });
    await new Promise((r) => setTimeout(r, 100));
    const client = await connectSensor(server, credential);
    await client.publishAsync(`benchwarden/v1/sensors/${credential.id}/readings`, JSON.stringify([{ n: "medium.moisture", u: "/", v: 0.61 }]), { qos: 1 });
    await client.endAsync();
    const event = readingsEventSchema.parse(await received);
    expect(event.readings).toContainEqual(expect.objectContaining({ sensorId: credential.id, quantity: "medium.moisture", value: 0.61, status: "above" }));
  });
});
