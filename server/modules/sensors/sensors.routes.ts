import { Router } from "express";
import { registerSensorInputSchema, sensorIdSchema, updateSensorInputSchema } from "../../../shared/schemas/sensors.js";
import { ADMIN_ONLY, type RouteTable } from "../../lib/auth.js";
import type { SensorsService } from "./sensors.service.js";

export function sensorsRoutes(table: RouteTable, sensors: SensorsService): Router {
  const r = table.router("/api", Router());
  const idOf = (params: Record<string, unknown>) => sensorIdSchema.parse(params.id);

  r.get("/sensors", ADMIN_ONLY, async (_req, res) => {
    res.json({ sensors: await sensors.list() });
  });
  r.post("/sensors", ADMIN_ONLY, async (req, res) => {
    res.status(201).json(await sensors.register(registerSensorInputSchema.parse(req.body)));
  });
  r.post("/sensors/:id/secret", ADMIN_ONLY, async (req, res) => {
    res.json(await sensors.rotate(idOf(req.params)));
  });
  r.patch("/sensors/:id", ADMIN_ONLY, async (req, res) => {
    res.json({ sensor: await sensors.update(idOf(req.params), updateSensorInputSchema.parse(req.body)) });
  });
  return r.router;
}
