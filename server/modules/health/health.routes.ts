import { Router } from "express";
import type { DataSource } from "typeorm";
import type { Metrics } from "../../lib/metrics.js";

export function healthRoutes(dataSource: DataSource, metrics: Metrics): Router {
  const router = Router();
  router.get("/healthz", async (_req, res) => {
    try {
      await dataSource.query("SELECT 1");
      res.json({ status: "ok" });
    } catch {
      res.status(503).json({ status: "unavailable", detail: "database not answering" });
    }
  });
  router.get("/metrics", (_req, res) => {
    res.type("text/plain; version=0.0.4; charset=utf-8").send(metrics.render());
  });
  return router;
}
