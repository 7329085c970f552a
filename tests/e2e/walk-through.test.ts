import { join } from "node:path";
import { AxeBuilder } from "@axe-core/playwright";
import type { Browser, BrowserContext, Page } from "playwright-core";
import sharp from "sharp";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { addDays, localDate } from "../../shared/domain/batch-calendar.js";
import { batchResponseSchema, observationsResponseSchema, type BatchView } from "../../shared/schemas/batches.js";
import { layoutResponseSchema, type LayoutResponse } from "../../shared/schemas/layout.js";
import { caughtMailResponseSchema } from "../../shared/schemas/mail.js";
import { roundResponseSchema } from "../../shared/schemas/rounds.js";
import { DIST_DIR, launchChromium, SCREENSHOT_DIR, TABLET } from "../support/browser.js";
import { connectSensor, signIn, startTestServer, TEST_DEMO_PASSWORD, waitFor, type TestServer } from "../support/test-server.js";

/**
 * The morning walk-through on a tablet (issue 6 "Done when"): a grower signs in through the
 * sign-in page at 768×1024, walks a round of a zone, records an observation with a photo,
 * checks every bench off and finishes; the summary mail reaches the SMTP sink. Then a second
 * round goes offline (the browser's offline mode) halfway, two observations are recorded, and
 * both are stored once the connection is back. axe-core checks the round's pages.
 */
const LANDSCAPE = { width: 1024, height: 768 };
const TZ = "America/Chicago"; // the demo site's
const MIN = 60_000;

let server: TestServer;
let browser: Browser;
let context: BrowserContext;
let page: Page;
let grower: string;
let admin: string;
let layout: LayoutResponse;
const batches: Record<string, BatchView> = {};

async function api<T>(token: string, path: string, init: { method?: string; body?: unknown } = {}): Promise<T> {
  const res = await fetch(`${server.baseUrl}${path}`, {
    method: init.method ?? "GET",
    headers: { Authorization: `Bearer ${token}`, "Content-Type": "application/json", Accept: "application/json" },
    body: init.body === undefined ? undefined : JSON.stringify(init.body),
  });
  if (!res.ok) throw new Error(`${init.method ?? "GET"} ${path} → ${res.status} ${await res.text()}`);
  return (await res.json()) as T;
}

async function createBatch(variety: string, benchId: number, countStuck: number, daysAgo: number): Promise<BatchView> {
  const stuckOn = addDays(localDate(Date.now(), TZ), -daysAgo);
  const body = await api<unknown>(grower, "/api/batches", { method: "POST", body: { variety, stuckOn, countStuck, benchId, baseTreatments: ["scored"] } });
  return batchResponseSchema.parse(body).batch;
}

async function observationsOf(batchId: number) {
  return observationsResponseSchema.parse(await api(grower, `/api/batches/${batchId}/observations`)).observations;
}

/** No serious or critical accessibility violation (WCAG 2 A/AA rules, contrast included). */
async function expectAccessible(name: string) {
  const results = await new AxeBuilder({ page }).withTags(["wcag2a", "wcag2aa", "wcag21a", "wcag21aa"]).analyze();
  expect(results.passes.length).toBeGreaterThan(10); // axe did run (contrast, names, labels …)
  const bad = results.violations.filter((v: { impact?: string | null }) => v.impact === "serious" || v.impact === "critical");
  const described = bad.map((v) => `${name}: ${v.id} (${v.impact}) ${v.help} — ${v.nodes.map((n) => n.target.join(" ")).slice(0, 3).join(", ")}`);
  expect(described).toEqual([]);
}

/** Controls on the page (in main) smaller than a 44 × 44 px touch target; radios count by their tile. */
async function smallTouchTargets(): Promise<string[]> {
  return page.evaluate(`[...document.querySelectorAll("main :is(button, a[href], select, textarea, input:not([type=radio]):not([type=checkbox]):not([type=file]), label:has(> input[type=radio]), label:has(> input[type=file]))")]
    .filter((el) => { const r = el.getBoundingClientRect(); return r.width > 0 && !el.closest(".sr-only") && (r.height < 44 || r.width < 44); })
    .map((el) => el.outerHTML.slice(0, 120))`);
}

async function screenshot(name: string, viewport = TABLET, fullPage = false) {
  await page.setViewportSize(viewport);
  await page.waitForTimeout(150);
  await page.screenshot({ path: join(SCREENSHOT_DIR, `${name}.png`), fullPage });
}

/** Opens the quick entry of a batch on its card and fills it in. */
async function recordObservation(batch: BatchView, entry: { stage: string; flags: string[]; note: string; photo?: Buffer }) {
  const section = page.locator(`section[data-batch-id="${batch.id}"]`);
  await section.getByRole("button", { name: `Record observation of ${batch.variety}` }).click();
  const form = section.getByRole("form", { name: `Observation of ${batch.variety}` });
  await form.getByRole("radio", { name: entry.stage }).check();
  for (const flag of entry.flags) await form.getByRole("button", { name: flag, exact: true }).click();
  await form.getByLabel("Note").fill(entry.note);
  if (entry.photo) {
    await form.locator('input[type="file"]').setInputFiles({ name: "IMG_2041.jpg", mimeType: "image/jpeg", buffer: entry.photo });
    await form.getByRole("img", { name: "New photo 1" }).waitFor();
  }
  return { section, form };
}

/** A 640×480 JPEG as a tablet camera might give, made here. */
async function cameraJpeg(colour: string): Promise<Buffer> {
  return sharp({ create: { width: 640, height: 480, channels: 3, background: colour } })
    .jpeg({ quality: 85 })
    .toBuffer();
}

beforeAll(async () => {
  server = await startTestServer({ ALERT_TICK: "1h" }, { staticDir: DIST_DIR });
  browser = await launchChromium();
  [grower, admin] = await Promise.all([signIn(server, "grower"), signIn(server, "admin")]);
  layout = layoutResponseSchema.parse(await api(grower, "/api/layout"));
  const [zone1, zone2] = layout.zones;
  const house1 = layout.benches.filter((b) => b.zoneId === zone1!.id);
  const house2 = layout.benches.filter((b) => b.zoneId === zone2!.id);

  // Bench 1 of House 1: the last hour's readings, a cold spell in the middle (19 °C, below 70 °F).
  const air = server.credentials.find((c) => c.benchId === house1[0]!.id && c.kind === "air")!;
  const medium = server.credentials.find((c) => c.benchId === house1[0]!.id && c.kind === "medium")!;
  const t0S = Math.floor((Date.now() - 60 * MIN) / MIN) * 60;
  const airPack = Array.from({ length: 30 }, (_, i) => [
    { n: `${air.id}:air.temperature`, u: "Cel", v: i < 10 ? 22 : i < 18 ? 19 : 24.5, t: t0S + i * 60 },
    { n: `${air.id}:air.humidity`, u: "%RH", v: 82, t: t0S + i * 60 },
  ]).flat();
  const mediumPack = Array.from({ length: 30 }, (_, i) => [
    { n: `${medium.id}:medium.temperature`, u: "Cel", v: 23 + (i % 5) * 0.1, t: t0S + i * 60 },
    { n: `${medium.id}:medium.moisture`, u: "/", v: 0.38, t: t0S + i * 60 },
  ]).flat();
  for (const [credential, pack] of [[air, airPack], [medium, mediumPack]] as const) {
    const client = await connectSensor(server, credential);
    await client.publishAsync(`benchwarden/v1/sensors/${credential.id}/readings`, JSON.stringify(pack), { qos: 1 });
    await client.endAsync();
  }

  // Batches made through the API first; the walk-through records on them.
  batches.amber = await createBatch("Harbour Amber", house1[0]!.id, 60, 20);
  batches.turkey = await createBatch("Brown Turkey", house1[1]!.id, 40, 12);
  batches.celeste = await createBatch("Celeste", house2[0]!.id, 50, 18);
  batches.violette = await createBatch("Violette de Bordeaux", house2[0]!.id, 30, 9);

  context = await browser.newContext({ viewport: TABLET, deviceScaleFactor: 1, hasTouch: true });
  page = await context.newPage();
}, 90_000);

afterAll(async () => {
  await context?.close();
  await browser?.close();
  await server?.cleanup();
});

describe("the morning walk-through in Chromium at tablet size", () => {
  it("a grower walks House 1, records an observation with a photo, checks every bench off and finishes; the summary is mailed", async () => {
    // Sign in through the sign-in page, as a person would.
    await page.goto(`${server.baseUrl}/`);
    await page.waitForURL(/\/sign-in/);
    await page.getByLabel("E-mail").fill("grower@nursery.test");
    await page.getByLabel("Password", { exact: true }).fill(TEST_DEMO_PASSWORD);
    await page.getByRole("button", { name: "Sign in" }).click();
    await page.locator("article[data-bench-id]").first().waitFor({ timeout: 10_000 });

    await page.getByRole("link", { name: "Walk-through" }).click();
    await page.getByRole("heading", { name: "Morning walk-through" }).waitFor();
    await screenshot("walk-through-start-portrait");
    await expectAccessible("start page");

    await page.getByRole("button", { name: /^Walk House 1/ }).click();
    await page.waitForURL(/\/rounds\/\d+$/);
    const roundId = Number(new URL(page.url()).pathname.split("/").pop());
    const cards = page.locator("article[data-bench-id]");
    await cards.first().waitFor({ timeout: 10_000 });
    expect(await cards.count()).toBe(4);

    // Bench 1's card in °F (the grower's unit): 19 °C = 66.2 °F, 24.5 °C = 76.1 °F (NIST SP 811).
    const bench1 = page.locator(`article[data-bench-id="${batches.amber!.bench.benchId}"]`);
    const airTile = bench1.getByRole("group", { name: "Air temperature" });
    await expect.poll(() => airTile.innerText()).toContain("66.2");
    expect(await airTile.innerText()).toContain("76.1");
    expect(await airTile.innerText()).toMatch(/8 min\s+out of window/);
    await screenshot("walk-through-round-portrait");
    await expectAccessible("round page");

    // One observation with a photo straight from the "camera".
    const photo = await cameraJpeg("#5b7a3a");
    const { section } = await recordObservation(batches.amber!, { stage: "Callused", flags: ["Mould", "Medium too wet"], note: "White fuzz on two bases", photo });
    await screenshot("walk-through-entry-portrait");
    await expectAccessible("observation entry");
    expect(await smallTouchTargets()).toEqual([]);
    await section.getByRole("button", { name: "Save observation" }).click();
    await section.getByText("Saved").waitFor({ timeout: 10_000 });
    const thumbnail = section.getByRole("img", { name: /^Photo 1 of Harbour Amber/ });
    await thumbnail.waitFor({ timeout: 10_000 });
    await expect.poll(() => thumbnail.evaluate((img) => (img as unknown as { naturalWidth: number }).naturalWidth)).toBeGreaterThan(0);
    const stored = await observationsOf(batches.amber!.id);
    expect(stored).toHaveLength(1);
    expect(stored[0]).toMatchObject({ stage: "callused", flags: ["mould", "medium-too-wet"], note: "White fuzz on two bases", roundId });
    expect(stored[0]!.photos).toHaveLength(1);

    // Every bench checked off, in walking order.
    for (let i = 0; i < 4; i++) {
      const card = cards.nth(i);
      const name = await card.locator("h3").innerText();
      await card.getByRole("button", { name: `${name} checked` }).click();
      await expect.poll(() => card.getAttribute("data-checked"), { timeout: 10_000 }).toBe("checked");
    }
    await page.getByText("4 of 4 benches checked").waitFor();
    await page.evaluate("window.scrollTo(0, 0)");
    await screenshot("walk-through-round-landscape", LANDSCAPE);
    await page.setViewportSize(TABLET);

    await page.getByRole("button", { name: "Finish the walk-through" }).click();
    await page.getByRole("heading", { name: "Walk-through summary: House 1 · Fig cuttings" }).waitFor({ timeout: 10_000 });
    const summaryText = await page.locator("main").innerText();
    expect(summaryText).toContain("4 of 4");
    expect(summaryText).toContain("Marisol Ortega");
    expect(summaryText).toMatch(/mould, medium too wet — “White fuzz on two bases”/);
    await page.getByRole("img", { name: /^Photo 1 of Harbour Amber/ }).waitFor({ timeout: 10_000 });
    await screenshot("walk-through-summary-portrait", TABLET, true);
    await expectAccessible("summary page");
    await screenshot("walk-through-summary-landscape", LANDSCAPE);
    await page.setViewportSize(TABLET);

    // The summary mail, caught by the SMTP sink, links back to this page.
    const mail = await waitFor(async () => {
      const { messages } = caughtMailResponseSchema.parse(await api(admin, "/api/mail"));
      return messages.find((m) => m.subject.startsWith("Walk-through House 1"));
    }, 10_000);
    expect(mail.to).toEqual(["manager@nursery.test"]);
    expect(mail.subject).toContain("4 of 4 benches checked");
    expect(mail.text).toContain(`/rounds/${roundId}`);

    // The mail's link opens the same summary.
    await page.goto(`${server.baseUrl}/rounds/${roundId}`);
    await page.getByRole("heading", { name: "Walk-through summary: House 1 · Fig cuttings" }).waitFor({ timeout: 10_000 });
  });

  it("offline halfway through a round: two observations and a check-off wait on the tablet and are stored once the connection is back", async () => {
    await page.goto(`${server.baseUrl}/rounds`);
    await page.getByRole("button", { name: /^Walk House 2/ }).click();
    await page.waitForURL(/\/rounds\/\d+$/);
    const roundId = Number(new URL(page.url()).pathname.split("/").pop());
    const bench = page.locator(`article[data-bench-id="${batches.celeste!.bench.benchId}"]`);
    await bench.waitFor({ timeout: 10_000 });

    // An unfinished round is resumed, not started twice.
    await page.getByRole("link", { name: "Walk-through" }).click();
    await page.getByRole("link", { name: /^Resume House 2/ }).click();
    await page.waitForURL(`${server.baseUrl}/rounds/${roundId}`);
    await bench.waitFor({ timeout: 10_000 });

    // The greenhouse Wi-Fi drops.
    await context.setOffline(true);
    await expect.poll(() => page.evaluate("navigator.onLine")).toBe(false);
    const indicator = page.getByTestId("waiting-to-send");
    await expect.poll(() => indicator.innerText()).toContain("Offline");

    const first = await recordObservation(batches.celeste!, { stage: "Root initials", flags: ["Buds breaking"], note: "First white root tips", photo: await cameraJpeg("#7a5b3a") });
    await first.form.getByText("will be kept on this tablet").waitFor();
    await first.form.getByRole("button", { name: "Save observation" }).click();
    const second = await recordObservation(batches.violette!, { stage: "Callused", flags: ["Medium too dry"], note: "Edge pots drying out" });
    await second.form.getByRole("button", { name: "Save observation" }).click();
    await bench.getByRole("button", { name: `${await bench.locator("h3").innerText()} checked` }).click();

    await expect.poll(() => indicator.innerText()).toContain("3 waiting to send");
    expect(await first.section.getByText("Waiting to send").count()).toBe(1);
    expect(await second.section.getByText("Waiting to send").count()).toBe(1);
    await bench.getByText("Checked · waiting to send").waitFor();
    expect(await page.getByRole("button", { name: "Finish the walk-through" }).isDisabled()).toBe(true);
    await bench.scrollIntoViewIfNeeded();
    await screenshot("walk-through-offline-portrait");
    await expectAccessible("round page offline");
    await screenshot("walk-through-offline-landscape", LANDSCAPE);
    await page.setViewportSize(TABLET);
    // Nothing reached the server meanwhile.
    expect(await observationsOf(batches.celeste!.id)).toHaveLength(0);

    // The connection returns: everything is sent by itself, each once.
    const backOnlineMs = Date.now();
    await context.setOffline(false);
    await expect.poll(() => indicator.count(), { timeout: 20_000 }).toBe(0);
    const celeste = await observationsOf(batches.celeste!.id);
    const violette = await observationsOf(batches.violette!.id);
    expect(celeste).toHaveLength(1);
    expect(violette).toHaveLength(1);
    expect(celeste[0]).toMatchObject({ stage: "root-initials", flags: ["buds-breaking"], note: "First white root tips", roundId });
    expect(celeste[0]!.photos).toHaveLength(1);
    expect(violette[0]).toMatchObject({ stage: "callused", flags: ["medium-too-dry"], note: "Edge pots drying out", roundId });
    expect(celeste[0]!.clientId).not.toBe(violette[0]!.clientId);
    const round = roundResponseSchema.parse(await api(grower, `/api/rounds/${roundId}`)).round;
    expect(round.checkedCount).toBe(1);
    // The check-off keeps the time it was tapped, not the time it reached the server.
    expect(round.benches.find((b) => b.check !== null)!.check!.atMs).toBeLessThan(backOnlineMs);
    await first.section.getByText("Saved").waitFor({ timeout: 10_000 });
    await second.section.getByText("Saved").waitFor({ timeout: 10_000 });
    // A reload after sending leaves nothing waiting and nothing sent twice.
    await page.reload();
    await bench.waitFor({ timeout: 10_000 });
    expect(await indicator.count()).toBe(0);
    expect(await observationsOf(batches.celeste!.id)).toHaveLength(1);
  });

  it("batch pages: a new batch through the form, its page with observations and photos, a move and a close; the reports page and its CSV", async () => {
    await page.setViewportSize(TABLET);
    await page.goto(`${server.baseUrl}/batches`);
    await page.getByRole("heading", { name: "Batches" }).waitFor({ timeout: 10_000 });
    await page.locator(`tr[data-batch-id="${batches.amber!.id}"]`).waitFor();
    await screenshot("batches-list-portrait");
    await expectAccessible("batches list");

    await page.getByRole("link", { name: "+ New batch" }).click();
    const form = page.getByRole("form", { name: "New batch" });
    await form.getByLabel("Variety").fill("Black Madeira");
    await form.getByLabel("Cuttings stuck").fill("24");
    await form.getByLabel("Bench").selectOption({ label: "Bench 3 · House 1 · Fig cuttings" });
    await form.getByRole("button", { name: "Rooting hormone" }).click();
    await form.getByRole("button", { name: "Save the batch" }).click();
    // The shared treatment rule: a product must be named with the hormone.
    await form.getByText("Name the product and strength").waitFor();
    await form.getByLabel("Hormone product and strength").fill("IBA 3000 ppm talc");
    await form.getByLabel("Cutting thickness (mm)").fill("11.5");
    await screenshot("batch-new-portrait", TABLET, true);
    await form.getByRole("button", { name: "Save the batch" }).click();
    await page.getByRole("heading", { name: "Black Madeira" }).waitFor({ timeout: 10_000 });
    const newId = Number(new URL(page.url()).pathname.split("/").pop());
    const created = batchResponseSchema.parse(await api(grower, `/api/batches/${newId}`)).batch;
    expect(created).toMatchObject({ countStuck: 24, thicknessMm: 11.5, baseTreatments: ["hormone"], hormoneProduct: "IBA 3000 ppm talc", bench: { benchName: "Bench 3" } });

    // Move it, then close it potted on.
    await page.getByRole("button", { name: "Move to another bench" }).click();
    const move = page.getByRole("form", { name: "Move Black Madeira" });
    await move.getByLabel("To bench").selectOption({ label: "Bench 4 · House 1 · Fig cuttings" });
    await move.getByLabel("Why (optional)").fill("Heat mat on Bench 3 failed");
    await move.getByRole("button", { name: "Move" }).click();
    await page.getByText("Heat mat on Bench 3 failed").first().waitFor({ timeout: 10_000 });
    await page.getByRole("button", { name: "Close with an outcome" }).click();
    const close = page.getByRole("form", { name: "Close Black Madeira" });
    await close.getByLabel("Rooted in the end").fill("20");
    await close.getByLabel("Lost in the end").fill("4");
    await close.getByRole("button", { name: "Close the batch" }).click();
    await page.getByRole("button", { name: "Reopen" }).waitFor({ timeout: 10_000 });
    const closed = batchResponseSchema.parse(await api(grower, `/api/batches/${newId}`)).batch;
    expect(closed).toMatchObject({ status: "closed", outcome: "potted-on", tally: { rooted: 20, lost: 4, isFinal: true } });
    expect(closed.placements.map((p) => p.benchName)).toEqual(["Bench 3", "Bench 4"]);

    // The batch walked in the first round: its observation and photo over time.
    await page.goto(`${server.baseUrl}/batches/${batches.amber!.id}`);
    await page.getByRole("img", { name: /^Photo 1 of Harbour Amber/ }).waitFor({ timeout: 10_000 });
    await screenshot("batch-detail-portrait", TABLET, true);
    await expectAccessible("batch page");
    await screenshot("batch-detail-landscape", LANDSCAPE);
    await page.setViewportSize(TABLET);

    await page.getByRole("link", { name: "Reports" }).click();
    await page.getByRole("heading", { name: "Strike rates" }).waitFor({ timeout: 10_000 });
    await page.getByRole("heading", { name: "By variety" }).waitFor();
    expect(await page.locator("main").innerText()).toContain("Black Madeira");
    await screenshot("reports-portrait", TABLET, true);
    await expectAccessible("reports page");
    await screenshot("reports-landscape", LANDSCAPE, true);
    await page.setViewportSize(TABLET);
    const href = await page.getByRole("link", { name: "Batches CSV" }).getAttribute("href");
    const csv = await page.request.get(`${server.baseUrl}${href}`);
    expect(csv.status()).toBe(200);
    expect(csv.headers()["content-type"]).toContain("text/csv");
    expect(await csv.text()).toContain("Black Madeira");
  });
});
