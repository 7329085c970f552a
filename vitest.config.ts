import react from "@vitejs/plugin-react";
import { defineConfig } from "vitest/config";

// Two projects: node for shared/server/simulator code and the cross-boundary tests,
// happy-dom for React components (STACK.md: faster here than jsdom).
export default defineConfig({
  test: {
    projects: [
      {
        test: {
          name: "node",
          environment: "node",
          include: ["shared/**/*.test.ts", "server/**/*.test.ts", "sensors-sim/**/*.test.ts", "tests/**/*.test.ts"],
          testTimeout: 30_000,
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
