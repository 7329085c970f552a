import react from "@vitejs/plugin-react";
import { defineConfig } from "vitest/config";

// Three projects: node for shared/server/simulator code and the cross-boundary tests, browser
// for the Chromium tests (one file at a time), happy-dom for React components (STACK.md: faster
// here than jsdom).
export default defineConfig({
  test: {
    projects: [
      {
        test: {
          name: "node",
          environment: "node",
          include: ["shared/**/*.test.ts", "server/**/*.test.ts", "sensors-sim/**/*.test.ts", "tests/**/*.test.ts"],
          exclude: ["tests/e2e/**"],
          testTimeout: 30_000,
          hookTimeout: 60_000,
        },
      },
      {
        // Each browser test file starts Chromium and a server; one file at a time keeps two cores
        // from being shared four ways.
        test: {
          name: "browser",
          environment: "node",
          include: ["tests/e2e/**/*.test.ts"],
          fileParallelism: false,
          testTimeout: 90_000,
          hookTimeout: 60_000,
        },
      },
      {
        plugins: [react()],
        test: {
          name: "web",
          environment: "happy-dom",
          include: ["src/**/*.test.{ts,tsx}"],
          setupFiles: ["src/testing/setup.ts"],
        },
      },
    ],
  },
});
