import { Router } from "express";
import type { DataSource } from "typeorm";
import type { RouteTable } from "../../lib/auth.js";
import type { Metrics } from "../../lib/metrics.js";

/** For operators and their monitoring: open, like any scrape target on the nursery's own network. */
export function healthRoutes(table: RouteTable, dataSource: DataSource, metrics: Metrics, brokerStatus: () => string): Router {
  const r = table.router("", Router());
  // Fails (503) when the database or the broker is down, so a supervisor can restart us.
  r.get("/healthz", "public", async (_req, res) => {
    let database = "ok";
    try {
      await dataSource.query("SELECT 1");
    } catch {
      database = "not answering";
    }
    // The embedded broker: "not listening"; the connection to an external one: "not connected".
    const broker = brokerStatus();
    const ok = database === "ok" && broker === "ok";
    res.status(ok ? 200 : 503).json({ status: ok ? "ok" : "unavailable", database, broker });
  });
  r.get("/metrics", "public", async (_req, res) => {
    res.type(metrics.contentType).send(await metrics.render());
  });
  return r.router;
}
