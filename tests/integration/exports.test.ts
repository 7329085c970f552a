import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { problemSchema } from "../../shared/api-error.js";
import { celsiusToFahrenheit } from "../../shared/domain/units.js";
import { layoutResponseSchema, type LayoutResponse } from "../../shared/schemas/layout.js";
import { connectSensor, signIn, startTestServer, type TestServer } from "../support/test-server.js";

/** CSV exports of readings for a bench or a zone, raw or rolled up, with units in the header. */
let server: TestServer;
let viewer: string;
let layout: LayoutResponse;
/** Start of the readings: a whole 5 minutes, an hour ago. */
let t0Ms: number;
let combined: { id: string; secret: string; benchId: number };

beforeAll(async () => {
  server = await startTestServer({ ALERT_TICK: "1h" });
  viewer = await signIn(server, "viewer");
  layout = layoutResponseSchema.parse((await request(server.baseUrl).get("/api/layout").auth(viewer, { type: "bearer" }).expect(200)).body);
  t0Ms = Math.floor((Date.now() - 3600_000) / 300_000) * 300_000;
  combined = server.credentials.find((c) => c.kind === "combined" && c.benchId === layout.benches[2]!.id)!;

  // Six readings one minute apart on a combined probe: every quantity in one pack per time.
  const records = [0, 1, 2, 3, 4, 5].flatMap((i) => {
    const t = t0Ms / 1000 + i * 60;
    return [
      { n: "air.temperature", u: "Cel", v: 21 + i, t },
      { n: "air.humidity", u: "%RH", v: 80, t },
      { n: "medium.temperature", u: "Cel", v: 23, t },
      { n: "medium.moisture", u: "/", v: 0.4 + i * 0.01, t },
      { n: "battery", u: "%EL", v: 90, t },
    ];
  });
  await publish(combined, [{ bn: `${combined.id}:` }, ...records]);
  // And one air reading on the bench before it, in the same zone.
  const air = server.credentials.find((c) => c.kind === "air" && c.benchId === layout.benches[0]!.id)!;
  await publish(air, [{ n: "air.temperature", u: "Cel", v: 19.5, t: t0Ms / 1000 + 30 }]);
});

afterAll(async () => {
  await server.cleanup();
});

async function publish(credential: { id: string; secret: string }, pack: unknown[]): Promise<void> {
  const client = await connectSensor(server, credential);
  await client.publishAsync(`benchwarden/v1/sensors/${credential.id}/readings`, JSON.stringify(pack), { qos: 1 });
  await client.endAsync();
}

async function csv(query: string): Promise<{ res: request.Response; header: string[]; rows: string[][] }> {
  const res = await request(server.baseUrl).get(`/api/exports/readings.csv?${query}`).auth(viewer, { type: "bearer" }).expect(200);
  expect(res.headers["content-type"]).toBe("text/csv; charset=utf-8");
  expect(res.text.startsWith("\uFEFF")).toBe(true);
  const lines = res.text.slice(1).split("\r\n");
  expect(lines.pop()).toBe(""); // every line ends with CRLF (RFC 4180)
  const [header, ...rows] = lines.map((l) => l.split(","));
  return { res, header: header!, rows };
}

const range = () => `from=${t0Ms}&to=${t0Ms + 600_000}`;

describe("readings export", () => {
  it("raw, for a bench: one row per sensor and time, SI units named in the header", async () => {
    const { res, header, rows } = await csv(`benchId=${combined.benchId}&${range()}`);
    expect(res.headers["content-disposition"]).toMatch(/^attachment; filename="benchwarden-house-1-fig-cuttings-bench-3-\d{4}-\d{2}-\d{2}-to-\d{4}-\d{2}-\d{2}-raw\.csv"$/);
    expect(header).toEqual([
      "time (UTC)",
      "time (America/Chicago)",
      "zone",
      "bench",
      "sensor",
      "air.temperature (°C)",
      "air.humidity (%RH)",
      "medium.temperature (°C)",
      "medium.moisture (m³/m³)",
      "battery (%EL)",
    ]);
    expect(rows).toHaveLength(6);
    expect(rows[0]).toEqual([new Date(t0Ms).toISOString(), expect.any(String), "House 1 · Fig cuttings", "Bench 3", combined.id, "21", "80", "23", "0.4", "90"]);
    expect(rows[5]!.slice(5)).toEqual(["26", "80", "23", "0.45", "90"]);
    // Local time: America/Chicago is 5 or 6 hours behind UTC.
    const localAsUtc = Date.parse(rows[0]![1]!.replace(" ", "T") + "Z");
    expect([-5, -6]).toContain((localAsUtc - t0Ms) / 3600_000);
  });

  it("in °F and % VWC when asked, converted and so named", async () => {
    const { header, rows } = await csv(`benchId=${combined.benchId}&${range()}&temperatureUnit=F&moistureUnit=percent`);
    expect(header.slice(5)).toEqual(["air.temperature (°F)", "air.humidity (%RH)", "medium.temperature (°F)", "medium.moisture (% VWC)", "battery (%EL)"]);
    // NIST SP 811: 21 °C = 69.8 °F, 23 °C = 73.4 °F.
    expect(rows[0]!.slice(5)).toEqual([celsiusToFahrenheit(21).toFixed(1), "80", "73.4", "40", "90"]);
  });

  it("rolled up at 5 minutes: mean, min, max and count per quantity and bucket", async () => {
    const { header, rows } = await csv(`benchId=${combined.benchId}&${range()}&interval=5m`);
    expect(header.slice(0, 8)).toEqual(["time (UTC)", "time (America/Chicago)", "zone", "bench", "air.temperature mean (°C)", "air.temperature min (°C)", "air.temperature max (°C)", "air.temperature readings"]);
    expect(header).toHaveLength(4 + 5 * 4);
    expect(rows).toHaveLength(2);
    // First bucket t0 … t0+5 min holds readings 0–4 (21…25 °C), the second reading 5 (26 °C).
    expect(rows[0]!.slice(0, 1)).toEqual([new Date(t0Ms).toISOString()]);
    expect(rows[0]!.slice(4, 8)).toEqual(["23", "21", "25", "5"]);
    expect(rows[1]!.slice(4, 8)).toEqual(["26", "26", "26", "1"]);
    expect(rows[1]![0]).toBe(new Date(t0Ms + 300_000).toISOString());
  });

  it("for a zone: every bench, in time order then walking order", async () => {
    const zoneId = layout.benches[0]!.zoneId;
    const { rows } = await csv(`zoneId=${zoneId}&${range()}`);
    expect(rows.map((r) => r[3])).toEqual(["Bench 3", "Bench 1", "Bench 3", "Bench 3", "Bench 3", "Bench 3", "Bench 3"]);
    expect(rows[1]![5]).toBe("19.5");
    // Hourly buckets on UTC hours: Bench 1's reading and Bench 3's first five share t0's hour; the
    // sixth (t0 + 5 min) may fall in the next.
    const rolled = await csv(`zoneId=${zoneId}&${range()}&interval=1h`);
    const hour = (ms: number) => Math.floor(ms / 3600_000);
    const nextHour = hour(t0Ms + 300_000) !== hour(t0Ms);
    expect(rolled.rows.map((r) => r[3])).toEqual(nextHour ? ["Bench 1", "Bench 3", "Bench 3"] : ["Bench 1", "Bench 3"]);
    expect(rolled.rows[0]![0]).toBe(new Date(hour(t0Ms) * 3600_000).toISOString());
  });

  it("refuses an export without a bench or zone, a raw range over 31 days, and unknown benches", async () => {
    const agent = (q: string) => request(server.baseUrl).get(`/api/exports/readings.csv?${q}`).auth(viewer, { type: "bearer" });
    const none = problemSchema.parse(JSON.parse((await agent("interval=raw").expect(400)).text));
    expect(none.errors).toEqual([{ path: "benchId", message: "Choose a bench or a zone" }]);
    const long = problemSchema.parse(JSON.parse((await agent(`benchId=1&from=${Date.now() - 40 * 86400_000}`).expect(400)).text));
    expect(long.code).toBe("range-too-long");
    await agent(`benchId=1&from=${Date.now() - 40 * 86400_000}&interval=1h`).expect(200);
    // Times as ISO 8601 too.
    await agent("benchId=1&from=2026-01-01T00:00:00Z&to=2026-01-02").expect(200);
    expect(problemSchema.parse(JSON.parse((await agent("benchId=1&from=yesterday").expect(400)).text)).errors?.[0]?.path).toBe("from");
    expect(problemSchema.parse(JSON.parse((await agent("benchId=9999").expect(404)).text)).code).toBe("bench-not-found");
    const bad = problemSchema.parse(JSON.parse((await agent("benchId=1&interval=2m").expect(400)).text));
    expect(bad.errors?.[0]?.path).toBe("interval");
  });
});
