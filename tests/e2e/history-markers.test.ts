import { randomUUID } from "node:crypto";
import { join } from "node:path";
import type { Browser, Locator, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { addDays, localDate } from "../../shared/domain/batch-calendar.js";
import { batchResponseSchema, type BatchView } from "../../shared/schemas/batches.js";
import { layoutResponseSchema, type LayoutResponse } from "../../shared/schemas/layout.js";
import type { Quantity } from "../../shared/schemas/quantities.js";
import { rawDatabase } from "../../server/db/data-source.js";
import { ReadingsRepository, type ReadingRow } from "../../server/modules/readings/readings.repository.js";
import { DIST_DIR, launchChromium, PHONE, SCREENSHOT_DIR, TABLET } from "../support/browser.js";
import { connectSensor, signIn, startTestServer, type TestServer } from "../support/test-server.js";

/**
 * The history charts in Chromium against the real server and the built app (issue 7 §5): alerts
 * and walk-through observations marked on a bench's charts, told apart by shape and words, each
 * saying what it is on hover or tap; the zone's charts from one request, with the same marks
 * naming their bench. Screenshots at 768×1024 and 390×844 go to test-results/.
 */
let server: TestServer;
let browser: Browser;
let layout: LayoutResponse;
let grower: string;
const TZ = "America/Chicago"; // the demo site's
const MINUTE_MS = 60_000;
const DAY_MS = 86_400_000;

const shot = (page: Page, name: string, fullPage = false) => page.screenshot({ path: join(SCREENSHOT_DIR, name), fullPage });

async function post(path: string, body: unknown): Promise<unknown> {
  const res = await fetch(`${server.baseUrl}${path}`, { method: "POST", headers: { "Content-Type": "application/json", Authorization: `Bearer ${grower}` }, body: JSON.stringify(body) });
  if (!res.ok) throw new Error(`${path}: ${res.status} ${await res.text()}`);
  return res.json();
}

async function createBatch(variety: string, benchId: number, stuckOn: string): Promise<BatchView> {
  return batchResponseSchema.parse(await post("/api/batches", { variety, stuckOn, countStuck: 48, benchId })).batch;
}

const observe = (batchId: number, body: Record<string, unknown>) => post(`/api/batches/${batchId}/observations`, { clientId: randomUUID(), ...body });

let zoneId: number;
let benchOne: { id: number; name: string };
let benchTwo: { id: number; name: string };

beforeAll(async () => {
  server = await startTestServer({ ALERT_TICK: "1h" }, { staticDir: DIST_DIR });
  browser = await launchChromium();
  grower = await signIn(server, "grower");
  layout = layoutResponseSchema.parse(await (await fetch(`${server.baseUrl}/api/layout`, { headers: { Authorization: `Bearer ${grower}` } })).json());
  zoneId = layout.zones[0]!.id;
  const benches = layout.benches.filter((b) => b.zoneId === zoneId).sort((a, b) => a.position - b.position);
  [benchOne, benchTwo] = [benches[0]!, benches[1]!];

  // A week of readings every two minutes on the zone's benches (the ingest's own storage call,
  // readings and rollups together), ending half an hour ago.
  const repository = new ReadingsRepository(rawDatabase(server.dataSource));
  const kinds: Record<string, Quantity[]> = {
    air: ["air.temperature", "air.humidity"],
    medium: ["medium.temperature", "medium.moisture"],
    combined: ["air.temperature", "air.humidity", "medium.temperature", "medium.moisture"],
  };
  const value = (q: Quantity, t: number, i: number) => {
    const swing = Math.sin((2 * Math.PI * ((t % DAY_MS) / DAY_MS - 0.4)));
    if (q === "air.temperature") return 23.6 + 2 * swing + i * 0.3;
    if (q === "air.humidity") return 76 - 5 * swing - i;
    if (q === "medium.temperature") return 23 + 0.8 * swing;
    return 0.46 - 0.04 * (((t / DAY_MS) % 2) / 2);
  };
  const endMs = Math.floor(Date.now() / MINUTE_MS) * MINUTE_MS - 30 * MINUTE_MS;
  const probes = server.credentials.filter((c) => benches.some((b) => b.id === c.benchId));
  let rows: ReadingRow[] = [];
  for (let t = endMs - 7 * DAY_MS; t < endMs; t += 2 * MINUTE_MS) {
    for (const p of probes) {
      const i = benches.findIndex((b) => b.id === p.benchId);
      for (const q of kinds[p.kind]!) rows.push({ sensorId: p.id, benchId: p.benchId, quantity: q, timeMs: t, value: value(q, t, i) });
    }
    if (rows.length > 5000) {
      repository.insertReadings(rows);
      rows = [];
    }
  }
  repository.insertReadings(rows);

  // Bench 1's air went cold for the last 20 minutes: a real alert, raised by a round of the engine.
  const air = server.credentials.find((c) => c.kind === "air" && c.benchId === benchOne.id)!;
  const client = await connectSensor(server, air);
  const nowS = Math.floor(Date.now() / 1000);
  await client.publishAsync(
    `benchwarden/v1/sensors/${air.id}/readings`,
    JSON.stringify([1200, 900, 600, 300, 0].map((age) => ({ n: "air.temperature", u: "Cel", v: 16, t: nowS - age }))),
    { qos: 1 },
  );
  await client.endAsync();
  await server.alerts.engine.idle();
  await server.alerts.pass();

  // Batches and what the growers saw: one date-only observation three days back with a flag, two
  // this morning's round; and a batch moved from bench 2 to bench 1 two days ago, seen on bench 2 before.
  const today = localDate(Date.now(), TZ);
  const lantern = await createBatch("Copper Lantern", benchOne.id, addDays(today, -9)!);
  const amber = await createBatch("Harbour Amber", benchOne.id, addDays(today, -9)!);
  const saltmarsh = await createBatch("Saltmarsh Black", benchTwo.id, addDays(today, -9)!);
  await observe(lantern.id, { observedOn: addDays(today, -3), stage: "callused", flags: ["medium-too-wet"], note: "Tops of the pots damp after watering" });
  await observe(saltmarsh.id, { observedOn: addDays(today, -4), stage: "callused", rootedCount: 0, note: "Callus on most of them" });
  await post(`/api/batches/${saltmarsh.id}/move`, { benchId: benchOne.id, effectiveAtMs: Date.now() - 2 * DAY_MS, note: "Heat mat on bench 2 out" });
  await observe(lantern.id, { stage: "root-initials", rootedCount: 6, lostCount: 2, flags: ["mould"] });
  await observe(amber.id, { stage: "callused" });
}, 120_000);

afterAll(async () => {
  await browser?.close();
  await server?.cleanup();
});

async function signedInPage(viewport: { width: number; height: number }): Promise<Page> {
  const context = await browser.newContext({ viewport, deviceScaleFactor: 1 });
  await context.addCookies([{ name: "bw_session", value: grower, url: server.baseUrl, httpOnly: true, sameSite: "Strict" }]);
  return context.newPage();
}

/**
 * The alert's label on a chart: inside the plot (not cut off at either side or the top) and above
 * the observation lane under the chart.
 */
async function expectAlertLabelInPlot(figure: Locator) {
  const label = (await figure.locator("text.recharts-label").boundingBox())!;
  const plot = (await figure.locator(".recharts-surface").boundingBox())!;
  const lane = (await figure.getByRole("group", { name: "Observations on this chart" }).boundingBox())!;
  expect(label.x).toBeGreaterThanOrEqual(plot.x);
  expect(label.x + label.width).toBeLessThanOrEqual(plot.x + plot.width);
  expect(label.y).toBeGreaterThanOrEqual(plot.y);
  expect(label.y + label.height).toBeLessThanOrEqual(lane.y);
}

describe("marks on the history charts", () => {
  it("a bench's week: the alert and the observations are marked, by shape and words, and say what they are on hover or tap", async () => {
    const page = await signedInPage(TABLET);
    await page.goto(`${server.baseUrl}/benches/${benchOne.id}?range=7d`);
    await page.getByRole("heading", { name: "Last 7 days" }).waitFor({ timeout: 15_000 });
    const airFigure = page.getByRole("figure", { name: "Air temperature" });
    const marks = airFigure.locator("[data-observation-marker]");
    await expect.poll(() => marks.count(), { timeout: 10_000 }).toBe(2);
    // The alert: a dashed line labelled ⚠ with its summary; observations: thin solid lines and ◇ under the chart.
    await expect.poll(() => airFigure.locator(".bw-alert-marker").count(), { timeout: 10_000 }).toBe(1);
    expect(await airFigure.locator(".bw-alert-marker").innerHTML()).toContain("stroke-dasharray");
    expect(await airFigure.locator("text.recharts-label").allTextContents()).toEqual(["⚠ Air too cold"]);
    expect(await airFigure.locator(".bw-observation-marker").count()).toBe(3);
    expect(await airFigure.locator(".bw-observation-marker line").first().getAttribute("stroke-dasharray")).toBeNull();
    const key = page.getByRole("list", { name: "Chart key" });
    expect(await key.innerText()).toContain("Alert raised");
    expect(await key.innerText()).toContain("Observation (filled: something flagged)");
    // Saltmarsh Black was seen on bench 2, before it moved here: not on this bench's charts.
    const labels = await marks.evaluateAll((els) => els.map((e) => e.getAttribute("aria-label") ?? ""));
    expect(labels[0]).toMatch(/^Observation, .*\(entered later, no time\): Copper Lantern · Callused, flagged$/);
    expect(labels[1]).toMatch(/^2 observations, .*, some flagged$/);
    expect(labels.join(" ")).not.toContain("Saltmarsh");

    await airFigure.scrollIntoViewIfNeeded();
    await shot(page, "bench-markers-closed-tablet.png");

    // Hover: what was seen three days ago.
    await marks.nth(0).hover();
    const popover = airFigure.getByRole("group", { name: "Observation", exact: true });
    await popover.waitFor();
    const seen = await popover.innerText();
    expect(seen).toContain("(entered later, no time)");
    expect(seen).toContain("Copper Lantern · Callused");
    expect(seen).toContain("Flagged: Medium too wet");
    expect(seen).toContain("“Tops of the pots damp after watering”");
    expect(seen).toContain("Seen by Marisol Ortega");
    await page.mouse.move(5, 5);
    await expect.poll(() => popover.count()).toBe(0);

    // Tap: this morning's two, kept open until tapped again.
    await marks.nth(1).click();
    const both = airFigure.getByRole("group", { name: "2 observations" });
    await both.waitFor();
    const text = await both.innerText();
    expect(text).toContain("Copper Lantern · Root initials");
    expect(text).toContain("6 rooted, 2 lost so far, of 48 stuck");
    expect(text).toContain("Flagged: Mould");
    expect(text).toContain("Harbour Amber · Callused");
    expect(text).toContain("Nothing flagged");
    expect(await marks.nth(1).getAttribute("aria-expanded")).toBe("true");
    await airFigure.scrollIntoViewIfNeeded();
    await shot(page, "bench-markers-tablet.png");
    await shot(page, "bench-markers-tablet-full.png", true);
    await page.keyboard.press("Escape");
    await expect.poll(() => both.count()).toBe(0);

    // A phone, portrait: the same marks, the box kept on screen.
    const phone = await signedInPage(PHONE);
    await phone.goto(`${server.baseUrl}/benches/${benchOne.id}?range=7d`);
    await phone.getByRole("heading", { name: "Last 7 days" }).waitFor({ timeout: 15_000 });
    const phoneAir = phone.getByRole("figure", { name: "Air temperature" });
    await expect.poll(() => phoneAir.locator("[data-observation-marker]").count(), { timeout: 10_000 }).toBe(2);
    await phoneAir.locator("[data-observation-marker]").nth(1).click();
    const box = phoneAir.getByRole("group", { name: "2 observations" });
    await box.waitFor();
    const rect = (await box.boundingBox())!;
    expect(rect.x).toBeGreaterThanOrEqual(0);
    expect(rect.x + rect.width).toBeLessThanOrEqual(PHONE.width);
    await phoneAir.scrollIntoViewIfNeeded();
    await shot(phone, "bench-markers-phone.png");
    await phone.keyboard.press("Escape");
    await phoneAir.locator("[data-observation-marker]").nth(0).click();
    await phoneAir.getByRole("group", { name: "Observation", exact: true }).waitFor();
    await shot(phone, "bench-markers-phone-left.png");
    await phone.context().close();
    await page.context().close();
  });

  it("the zone's charts come from one request, with each observation on the bench its batch stood on and each alert naming its bench", async () => {
    const page = await signedInPage(TABLET);
    const asked: string[] = [];
    page.on("request", (r) => {
      const path = new URL(r.url()).pathname;
      if (path.startsWith("/api/") && path.endsWith("/readings")) asked.push(path);
    });
    await page.goto(`${server.baseUrl}/zones/${zoneId}?range=7d`);
    await page.getByRole("heading", { name: "Last 7 days" }).waitFor({ timeout: 15_000 });
    await expect.poll(() => page.locator("figure .recharts-surface").count(), { timeout: 15_000 }).toBe(4);
    expect(asked).toEqual([`/api/zones/${zoneId}/readings`]);
    const airFigure = page.getByRole("figure", { name: "Air temperature" });
    const marks = airFigure.locator("[data-observation-marker]");
    await expect.poll(() => marks.count(), { timeout: 10_000 }).toBe(3);
    const key = await page.getByRole("list", { name: "Benches on the charts" }).innerText();
    expect(key).toContain("Observation (filled: something flagged)");
    // Bench 1's cold air: a dashed line on the air temperature chart only, its label naming the bench.
    await expect.poll(() => airFigure.locator(".bw-alert-marker").count(), { timeout: 10_000 }).toBe(1);
    expect(await airFigure.locator(".bw-alert-marker").innerHTML()).toContain("stroke-dasharray");
    expect(await airFigure.locator("text.recharts-label").allTextContents()).toEqual([`⚠ ${benchOne.name} · Air too cold`]);
    for (const other of ["air.humidity", "medium.temperature", "medium.moisture"]) {
      expect(await page.locator(`figure[data-quantity="${other}"] .bw-alert-marker`).count()).toBe(0);
    }
    expect(key).toContain("Alert raised");
    await airFigure.scrollIntoViewIfNeeded();
    await expectAlertLabelInPlot(airFigure);
    await marks.nth(0).click();
    const early = airFigure.getByRole("group", { name: "Observation", exact: true });
    await early.waitFor();
    const text = await early.innerText();
    expect(text).toContain("Saltmarsh Black · Callused");
    expect(text).toContain(benchTwo.name);
    expect(text).toContain("0 rooted so far, of 48 stuck");
    await airFigure.scrollIntoViewIfNeeded();
    await shot(page, "zone-markers-tablet.png");
    await page.keyboard.press("Escape");

    const phone = await signedInPage(PHONE);
    await phone.goto(`${server.baseUrl}/zones/${zoneId}?range=7d`);
    await phone.getByRole("heading", { name: "Last 7 days" }).waitFor({ timeout: 15_000 });
    const phoneAir = phone.getByRole("figure", { name: "Air temperature" });
    await expect.poll(() => phoneAir.locator("[data-observation-marker]").count(), { timeout: 10_000 }).toBe(3);
    await expect.poll(() => phoneAir.locator(".bw-alert-marker").count(), { timeout: 10_000 }).toBe(1);
    expect(await phoneAir.locator("text.recharts-label").allTextContents()).toEqual([`⚠ ${benchOne.name} · Air too cold`]);
    await phoneAir.scrollIntoViewIfNeeded();
    await expectAlertLabelInPlot(phoneAir);
    await shot(phone, "zone-markers-alert-phone.png");
    await phoneAir.locator("[data-observation-marker]").nth(2).click();
    await phoneAir.getByRole("group", { name: "2 observations" }).waitFor();
    await phoneAir.scrollIntoViewIfNeeded();
    await shot(phone, "zone-markers-phone.png");
    await phone.context().close();
    await page.context().close();
  });
});
