import { Router } from "express";
import type { ZonesResponse } from "../../../shared/schemas/zones.js";
import { EVERYONE_SIGNED_IN, type RouteTable } from "../../lib/auth.js";
import type { ZonesService } from "./zones.service.js";

export function zonesRoutes(table: RouteTable, zones: ZonesService): Router {
  const r = table.router("/api", Router());
  r.get("/zones", EVERYONE_SIGNED_IN, async (_req, res) => {
    const body: ZonesResponse = { zones: await zones.listZones() };
    res.json(body);
  });
  return r.router;
}
