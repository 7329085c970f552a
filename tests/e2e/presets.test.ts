import { join } from "node:path";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { fahrenheitToCelsius } from "../../shared/domain/units.js";
import { windowPresetsResponseSchema, type WindowPreset } from "../../shared/schemas/windows.js";
import { DIST_DIR, launchChromium, PHONE, SCREENSHOT_DIR, TABLET } from "../support/browser.js";
import { signIn, startTestServer, type TestServer } from "../support/test-server.js";

/**
 * The presets page in Chromium against the real server: a preset is checked by the server's dry run
 * before it is stored (issue 7 §3), like a zone's window: guidance warnings with their source, a
 * taken name on its field, nothing saved until the manager saves anyway.
 */
let server: TestServer;
let browser: Browser;
let manager: string;

beforeAll(async () => {
  server = await startTestServer({ ALERT_TICK: "1h" }, { staticDir: DIST_DIR });
  browser = await launchChromium();
  manager = await signIn(server, "manager");
});

afterAll(async () => {
  await browser?.close();
  await server?.cleanup();
});

async function customPresets(): Promise<WindowPreset[]> {
  const res = await fetch(`${server.baseUrl}/api/window-presets`, { headers: { Authorization: `Bearer ${manager}` } });
  return windowPresetsResponseSchema.parse(await res.json()).presets.filter((p) => !p.builtIn);
}

async function managerPage(viewport: { width: number; height: number }): Promise<{ page: Page; sent: string[] }> {
  const context = await browser.newContext({ viewport, deviceScaleFactor: 1 });
  await context.addCookies([{ name: "bw_session", value: manager, url: server.baseUrl, httpOnly: true, sameSite: "Strict" }]);
  const page = await context.newPage();
  const sent: string[] = [];
  page.on("request", (r) => {
    const url = new URL(r.url());
    if (url.pathname.startsWith("/api/window-presets") && r.method() !== "GET") sent.push(`${r.method()} ${url.pathname}${url.search}`);
  });
  await page.goto(`${server.baseUrl}/settings/presets`);
  await page.getByRole("heading", { level: 1, name: "Window presets" }).waitFor({ timeout: 15_000 });
  return { page, sent };
}

const shot = (page: Page, name: string) => page.screenshot({ path: join(SCREENSHOT_DIR, name) });

describe("presets in Chromium", () => {
  it("as manager: the server's dry run warns about an air minimum below the guidance before the preset is created, and refuses a taken name on its field", async () => {
    const { page, sent } = await managerPage(TABLET);
    await page.getByRole("button", { name: "New preset", exact: true }).click();
    const form = page.getByRole("form", { name: "Preset" });
    // A name the built-in preset already has: the dry run's 409 lands on the field, nothing stored.
    await form.getByLabel("Name").fill("warm rooting");
    const air = form.getByRole("group", { name: "Air temperature" });
    const fill = async (group: string, values: [string, string, string, string]) => {
      const g = form.getByRole("group", { name: group });
      const [min, max, delay, band] = values;
      await g.getByLabel(/^Minimum/).fill(min);
      await g.getByLabel(/^Maximum/).fill(max);
      await g.getByLabel(/delay/i).fill(delay);
      await g.getByLabel(/clearing band/i).fill(band);
    };
    await fill("Air temperature", ["64", "80", "10", "1"]);
    await fill("Air humidity", ["65", "85", "30", "3"]);
    await fill("Medium temperature", ["70", "77", "15", "1"]);
    await fill("Medium moisture", ["35", "55", "60", "2"]);
    await form.getByRole("button", { name: "Check and create" }).click();
    const name = form.getByLabel("Name");
    await expect.poll(() => name.getAttribute("aria-invalid"), { timeout: 10_000 }).toBe("true");
    expect(await form.innerText()).toContain("This name is taken");
    expect(sent).toEqual(["POST /api/window-presets?dryRun=true"]);
    expect(await page.getByRole("region", { name: /Check before saving/ }).count()).toBe(0);

    await name.fill("Cool nights trial");
    await form.getByRole("button", { name: "Check and create" }).click();
    const review = page.getByRole("region", { name: /Check before saving/ });
    await review.waitFor({ timeout: 10_000 });
    const reviewText = await review.innerText();
    expect(reviewText).toContain("An air minimum below about 70 °F (21 °C)");
    expect(reviewText).toContain("Common practice");
    expect(reviewText).not.toContain("REFERENCES.md");
    // Two dry runs, nothing stored.
    expect(sent).toEqual(["POST /api/window-presets?dryRun=true", "POST /api/window-presets?dryRun=true"]);
    expect(await customPresets()).toEqual([]);
    await review.scrollIntoViewIfNeeded();
    await shot(page, "presets-dry-run-warning-tablet.png");

    await review.getByRole("button", { name: "Save anyway" }).click();
    await page.getByText("Preset “Cool nights trial” created").waitFor({ timeout: 10_000 });
    expect(sent.at(-1)).toBe("POST /api/window-presets");
    const [created] = await customPresets();
    expect(created).toMatchObject({ name: "Cool nights trial" });
    expect(created!.windows.find((w) => w.quantity === "air.temperature")!.min).toBeCloseTo(fahrenheitToCelsius(64), 10);

    // Editing it back inside the guidance: the dry run has no warning, so it saves straight away.
    await page.getByRole("button", { name: "Edit Cool nights trial" }).click();
    await air.getByLabel(/^Minimum/).waitFor();
    await page.getByRole("form", { name: "Preset" }).getByRole("group", { name: "Air temperature" }).getByLabel(/^Minimum/).fill("71");
    const before = sent.length;
    await page.getByRole("form", { name: "Preset" }).getByRole("button", { name: "Check and save" }).click();
    await page.getByText("Preset “Cool nights trial” saved").waitFor({ timeout: 10_000 });
    expect(sent.slice(before)).toEqual([`PATCH /api/window-presets/${created!.id}?dryRun=true`, `PATCH /api/window-presets/${created!.id}`]);
    expect((await customPresets())[0]!.windows.find((w) => w.quantity === "air.temperature")!.min).toBeCloseTo(fahrenheitToCelsius(71), 10);
    await page.context().close();
  });

  it("on a phone: the same warning from the dry run, before anything is saved", async () => {
    const { page, sent } = await managerPage(PHONE);
    await page.getByRole("button", { name: "Copy to a new preset" }).first().click();
    const form = page.getByRole("form", { name: "Preset" });
    await form.getByLabel("Name").fill("Phone copy");
    await form.getByRole("group", { name: "Air temperature" }).getByLabel(/^Minimum/).fill("62");
    await form.getByRole("button", { name: "Check and create" }).click();
    const review = page.getByRole("region", { name: /Check before saving/ });
    await review.waitFor({ timeout: 10_000 });
    expect(await review.innerText()).toContain("An air minimum below about 70 °F (21 °C)");
    expect(sent).toEqual(["POST /api/window-presets?dryRun=true"]);
    await review.scrollIntoViewIfNeeded();
    await shot(page, "presets-dry-run-warning-phone.png");
    await review.getByRole("button", { name: "Change the values" }).click();
    expect(await customPresets()).toHaveLength(1); // the first test's only
    await page.context().close();
  });
});
