import { Router } from "express";
import type { DataSource } from "typeorm";
import type { RouteTable } from "../../lib/auth.js";
import type { Metrics } from "../../lib/metrics.js";

/** For operators and their monitoring: open, like any scrape target on the nursery's own network. */
export function healthRoutes(table: RouteTable, dataSource: DataSource, metrics: Metrics): Router {
  const r = table.router("", Router());
  r.get("/healthz", "public", async (_req, res) => {
    try {
      await dataSource.query("SELECT 1");
      res.json({ status: "ok" });
    } catch {
      res.status(503).json({ status: "unavailable", detail: "database not answering" });
    }
  });
  r.get("/metrics", "public", (_req, res) => {
    res.type("text/plain; version=0.0.4; charset=utf-8").send(metrics.render());
  });
  return r.router;
}
