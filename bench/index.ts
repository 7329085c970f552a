/**
 * npm run bench [-- name…]: runs the benchmarks one after another, each in its own process, and
 * passes their output through. Figures, not assertions: the tests assert behaviour.
 */
import { spawnSync } from "node:child_process";
import { join } from "node:path";
import { PROJECT_ROOT } from "../server/index.js";

const BENCHES: Record<string, string> = {
  "alert-latency": "bench/alert-latency.ts",
  soak: "bench/soak.ts",
};

/** The ones `npm run bench` runs with no names: the soak takes half an hour, so it is asked for by name. */
const DEFAULT = ["alert-latency"];

const chosen = process.argv.slice(2).length ? process.argv.slice(2) : DEFAULT;
let failed = false;
for (const name of chosen) {
  const file = BENCHES[name];
  if (!file) {
    console.error(`unknown benchmark "${name}"; known: ${Object.keys(BENCHES).join(", ")}`);
    process.exit(2);
  }
  console.log(`\n== ${name}`);
  const run = spawnSync(process.execPath, [join(PROJECT_ROOT, "node_modules/tsx/dist/cli.mjs"), "--tsconfig", "tsconfig.server.json", file], {
    cwd: PROJECT_ROOT,
    stdio: "inherit",
    timeout: 20 * 60_000,
  });
  if (run.status !== 0) failed = true;
}
process.exit(failed ? 1 : 0);
