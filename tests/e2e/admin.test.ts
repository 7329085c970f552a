import { join } from "node:path";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DIST_DIR, launchChromium, PHONE, SCREENSHOT_DIR, TABLET } from "../support/browser.js";
import { startTestServer, TEST_DEMO_PASSWORD, type TestServer } from "../support/test-server.js";

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

/** Signs in through the sign-in page, as a person would. */
async function signInPage(role: string, viewport = TABLET): Promise<Page> {
  const context = await browser.newContext({ viewport });
  const page = await context.newPage();
  await page.goto(`${server.baseUrl}/`);
  await page.waitForURL(/\/sign-in/);
  await page.getByLabel("E-mail").fill(`${role}@nursery.test`);
  await page.getByLabel("Password", { exact: true }).fill(TEST_DEMO_PASSWORD);
  await page.getByRole("button", { name: "Sign in" }).click();
  await page.locator("article[data-bench-id]").first().waitFor({ timeout: 10_000 });
  return page;
}

describe("roles in Chromium", () => {
  it("a viewer sees no edit control, and a crafted API call is refused with 403", async () => {
    const page = await signInPage("viewer");
    expect(await page.getByRole("link", { name: "Sensors" }).count()).toBe(0);
    expect(await page.getByRole("link", { name: "Users" }).count()).toBe(0);
    await page.goto(`${server.baseUrl}/sensors`);
    await page.getByText("Not for your role").first().waitFor();
    expect(await page.getByRole("button", { name: /Register|Invite|New secret|Disable/ }).count()).toBe(0);
    const status = await page.evaluate(async () => {
      const res = await fetch("/api/sensors", { method: "POST", headers: { "Content-Type": "application/json" }, body: JSON.stringify({ id: "sneaky-1", kind: "air", benchId: null }) });
      return res.status;
    });
    expect(status).toBe(403);
    await page.screenshot({ path: join(SCREENSHOT_DIR, "viewer-sensors-tablet.png") });
    await page.context().close();
  });

  it("an admin registers a sensor and its secret is shown exactly once", async () => {
    const page = await signInPage("admin", PHONE);
    await page.goto(`${server.baseUrl}/sensors`);
    const form = page.getByRole("form", { name: "Register a sensor" });
    await form.getByLabel("Sensor id").fill("e2e-probe-1");
    await form.getByLabel("Bench").selectOption({ index: 1 });
    await form.getByRole("button", { name: /Register/ }).click();
    const secretBox = page.getByTestId("sensor-secret");
    await secretBox.waitFor();
    const secret = await secretBox.inputValue();
    expect(secret.length).toBeGreaterThanOrEqual(40);
    await page.screenshot({ path: join(SCREENSHOT_DIR, "admin-secret-phone.png") });
    await page.getByRole("button", { name: "I have stored it, close" }).click();
    await secretBox.waitFor({ state: "detached" });
    expect(await page.content()).not.toContain(secret);
    await page.getByText("e2e-probe-1").first().waitFor();
    await page.reload();
    await page.getByText("e2e-probe-1").first().waitFor();
    expect(await page.content()).not.toContain(secret);
    await page.context().close();
  });
});
