import { join } from "node:path";
import type { Browser, BrowserContext } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DIST_DIR, launchChromium, PHONE, SCREENSHOT_DIR, TABLET } from "../support/browser.js";
import { connectSensor, signIn, startTestServer, type TestServer } from "../support/test-server.js";

let server: TestServer;
let browser: Browser;

beforeAll(async () => {
  server = await startTestServer({}, { staticDir: DIST_DIR });
  browser = await launchChromium();
});

afterAll(async () => {
  await browser?.close();
  await server?.cleanup();
});

/** A browser context signed in as `role` through the real sign-in API (its cookie). */
async function signedInContext(role: "viewer" | "grower", viewport: { width: number; height: number }): Promise<BrowserContext> {
  const token = await signIn(server, role);
  const context = await browser.newContext({ viewport, deviceScaleFactor: 1 });
  await context.addCookies([{ name: "bw_session", value: token, url: server.baseUrl, httpOnly: true, sameSite: "Strict" }]);
  return context;
}

async function publish(credential: { id: string; secret: string }, pack: unknown[]): Promise<void> {
  const client = await connectSensor(server, credential);
  await client.publishAsync(`benchwarden/v1/sensors/${credential.id}/readings`, JSON.stringify(pack), { qos: 1 });
  await client.endAsync();
}

describe("dashboard in Chromium", () => {
  it("shows the twelve benches and turns a card out of window within 2 s of a cold reading, without reload", async () => {
    const air = server.credentials.find((c) => c.kind === "air")!;
    const medium = server.credentials.find((c) => c.kind === "medium" && c.benchId === air.benchId)!;
    const nowS = Math.floor(Date.now() / 1000);
    await publish(air, [{ bt: nowS, n: "air.temperature", u: "Cel", v: 23.5 }, { n: "air.humidity", u: "%RH", v: 84 }]);
    await publish(medium, [{ bt: nowS, n: "medium.temperature", u: "Cel", v: 22.6 }, { n: "medium.moisture", u: "/", v: 0.44 }]);

    const context = await signedInContext("viewer", TABLET);
    const page = await context.newPage();
    await page.goto(server.baseUrl);
    const card = page.locator(`article[data-bench-id="${air.benchId}"]`);
    await card.waitFor({ timeout: 10_000 });
    expect(await page.locator("article[data-bench-id]").count()).toBe(12);
    await expect.poll(() => card.getAttribute("data-status"), { timeout: 5000 }).toBe("inside");
    await expect.poll(() => card.innerText()).toContain("74.3"); // 23.5 °C in °F (NIST SP 811)

    // A cold night: 15 °C = 59.0 °F, below the 70 °F minimum.
    const sentAt = Date.now();
    await publish(air, [{ n: "air.temperature", u: "Cel", v: 15 }]);
    await expect.poll(() => card.getAttribute("data-status"), { timeout: 2000, interval: 50 }).toBe("below");
    const elapsedMs = Date.now() - sentAt;
    expect(elapsedMs).toBeLessThan(2000);
    const text = await card.innerText();
    expect(text).toContain("59.0");
    expect(text).toMatch(/Too cold/);
    await page.screenshot({ path: join(SCREENSHOT_DIR, "dashboard-tablet.png"), fullPage: false });

    await page.setViewportSize(PHONE);
    await page.screenshot({ path: join(SCREENSHOT_DIR, "dashboard-phone.png"), fullPage: false });
    await context.close();
  });

  it("opens a bench's 24-hour chart with its window band", async () => {
    const air = server.credentials.find((c) => c.kind === "air")!;
    const nowS = Math.floor(Date.now() / 1000);
    // An evening of readings every 10 minutes, warm then cooling.
    const pack = Array.from({ length: 36 }, (_, i) => ({
      bn: `${air.id}:`,
      n: "air.temperature",
      u: "Cel",
      v: 24 - i * 0.15,
      t: nowS - (36 - i) * 600,
    }));
    await publish(air, pack);
    const context = await signedInContext("viewer", TABLET);
    const page = await context.newPage();
    await page.goto(`${server.baseUrl}/benches/${air.benchId}`);
    await page.locator(".recharts-surface").first().waitFor({ timeout: 10_000 });
    expect(await page.locator(".recharts-reference-area").count()).toBeGreaterThan(0);
    await page.screenshot({ path: join(SCREENSHOT_DIR, "bench-tablet.png"), fullPage: true });
    await context.close();
  });
});
