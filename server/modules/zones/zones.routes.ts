import { Router } from "express";
import type { ZonesResponse } from "../../../shared/schemas/zones.js";
import type { ZonesService } from "./zones.service.js";

export function zonesRoutes(zones: ZonesService): Router {
  const router = Router();
  router.get("/zones", async (_req, res) => {
    const body: ZonesResponse = { zones: await zones.listZones() };
    res.json(body);
  });
  return router;
}
