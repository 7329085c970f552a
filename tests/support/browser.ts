import { existsSync, mkdirSync } from "node:fs";
import { join } from "node:path";
import { chromium, type Browser } from "playwright-core";
import { PROJECT_ROOT } from "../../server/index.js";

export const CHROMIUM_PATH = "/usr/bin/chromium";
export const DIST_DIR = join(PROJECT_ROOT, "dist");
/** Screenshots the browser tests take, to look at after a run. */
export const SCREENSHOT_DIR = join(PROJECT_ROOT, "test-results");

export const TABLET = { width: 768, height: 1024 };
export const PHONE = { width: 390, height: 844 };

/** Debian's Chromium, headless, with the flags that keep it off the network (STACK.md). */
export async function launchChromium(): Promise<Browser> {
  if (!existsSync(CHROMIUM_PATH)) throw new Error(`${CHROMIUM_PATH} is missing: run scripts/ensure-system-packages.sh`);
  if (!existsSync(join(DIST_DIR, "index.html"))) throw new Error("dist/ is missing: run `npx vite build` first (npm test does)");
  mkdirSync(SCREENSHOT_DIR, { recursive: true });
  return chromium.launch({
    executablePath: CHROMIUM_PATH,
    headless: true,
    args: [
      "--disable-gpu",
      "--disable-dev-shm-usage",
      "--disable-background-networking",
      "--disable-component-update",
      "--disable-sync",
      "--no-first-run",
    ],
  });
}
