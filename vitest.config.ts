import react from "@vitejs/plugin-react";
import { defineConfig } from "vitest/config";

// Four projects: node for shared/server/simulator code and the cross-boundary tests, postgres-api
// for the API's integration tests again on PostgreSQL, browser for the Chromium tests (one file at
// a time), happy-dom for React components (STACK.md: faster here than jsdom).
const POSTGRES_API_TESTS = [
  "accounts",
  "alert-timing",
  "alerts",
  "api",
  "batches",
  "broker-limits",
  "exports",
  "history-charts",
  "ingest",
  "layout",
  "photos",
  "roles",
  "rota",
  "rounds",
  "security",
  "sensor-calibration",
  "sensor-credentials",
  "windows",
];

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
        // The same HTTP API and alert pipeline tests on a throwaway PostgreSQL per file
        // (tests/support/test-server.ts). Left out: files about SQLite itself (startup: its files and
        // migrations; retention and external-broker: raw SQLite reads beside the server); their
        // PostgreSQL counterparts are in tests/postgres/.
        test: {
          name: "postgres-api",
          environment: "node",
          include: POSTGRES_API_TESTS.map((name) => `tests/integration/${name}.test.ts`),
          env: { BENCHWARDEN_TEST_DATABASE: "postgres" },
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
