/**
 * npm run bench              the full suite (bench/suite.ts): ceilings, product, alerts, charts,
 *                            client; a table, then one JSON line last
 * npm run bench -- --quick   the same, short and small (under two minutes)
 * npm run bench -- name…     single benchmarks, each in its own process, output passed through
 * Figures, not assertions: the tests assert behaviour.
 */
import { spawnSync } from "node:child_process";
import { join } from "node:path";
import { PROJECT_ROOT } from "../server/index.js";

const BENCHES: Record<string, string> = {
  "alert-latency": "bench/alert-latency.ts",
  soak: "bench/soak.ts",
  charts: "bench/charts.ts",
  "sqlite-ceiling": "bench/sqlite-ceiling.ts",
  "client-size": "bench/client-size.ts",
  cluster: "bench/cluster.ts",
};

const args = process.argv.slice(2);
if (args.length === 0 || (args.length === 1 && args[0] === "--quick")) {
  // The soak takes half an hour, so it is asked for by name.
  const { runSuite } = await import("./suite.js");
  await runSuite(args[0] === "--quick").then(
    () => process.exit(0),
    (err: unknown) => {
      console.error(err);
      process.exit(1);
    },
  );
}
const chosen = args;
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
    // Long enough for a full soak (30 min by default).
    timeout: (Number(process.env.SOAK_MINUTES ?? 30) + 15) * 60_000,
  });
  if (run.status !== 0) failed = true;
}
process.exit(failed ? 1 : 0);
