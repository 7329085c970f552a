import { Router } from "express";
import { z } from "zod";
import type { Role } from "../../../shared/schemas/auth.js";
import {
  assignSensorInputSchema,
  benchOrderInputSchema,
  createBenchInputSchema,
  createSiteInputSchema,
  createZoneInputSchema,
  layoutQuerySchema,
  updateBenchInputSchema,
  updateSiteInputSchema,
  updateZoneInputSchema,
  type LayoutResponse,
  type SensorAssignmentsResponse,
} from "../../../shared/schemas/layout.js";
import { sensorIdSchema } from "../../../shared/schemas/sensors.js";
import { ADMIN_ONLY, EVERYONE_SIGNED_IN, type RouteTable } from "../../lib/auth.js";
import type { SensorsService } from "../sensors/sensors.service.js";
import type { LayoutService } from "./layout.service.js";
import { rowIdParamSchema } from "../../../shared/schemas/ids.js";

/**
 * Who changes the layout (PRODUCT.md §3, §5): sites and zones are the admin's (a zone is a house
 * with its own heating regime, part of setting the nursery up); benches are the admin's and the
 * manager's (the manager arranges benches and their walking order through the season). Sensor
 * assignment is the admin's, like everything else about sensors. Every signed-in role reads.
 */
export const BENCH_EDITORS: readonly Role[] = ["admin", "manager"];

const idParams = z.object({ id: rowIdParamSchema });
const sensorParams = z.object({ id: sensorIdSchema });

export function layoutRoutes(table: RouteTable, layout: LayoutService, sensors: SensorsService): Router {
  const r = table.router("/api", Router());
  const id = (params: unknown) => idParams.parse(params).id;

  r.get("/layout", EVERYONE_SIGNED_IN, async (req, res) => {
    const body: LayoutResponse = await layout.layout(layoutQuerySchema.parse(req.query).includeArchived);
    res.json(body);
  });

  r.post("/sites", ADMIN_ONLY, async (req, res) => {
    res.status(201).json({ site: await layout.createSite(createSiteInputSchema.parse(req.body), req.principal!) });
  });
  r.patch("/sites/:id", ADMIN_ONLY, async (req, res) => {
    res.json({ site: await layout.updateSite(id(req.params), updateSiteInputSchema.parse(req.body), req.principal!) });
  });
  r.post("/sites/:id/archive", ADMIN_ONLY, async (req, res) => {
    res.json(await layout.archiveSite(id(req.params), req.principal!));
  });
  r.post("/sites/:id/restore", ADMIN_ONLY, async (req, res) => {
    res.json(await layout.restoreSite(id(req.params), req.principal!));
  });

  r.post("/zones", ADMIN_ONLY, async (req, res) => {
    res.status(201).json({ zone: await layout.createZone(createZoneInputSchema.parse(req.body), req.principal!) });
  });
  r.patch("/zones/:id", ADMIN_ONLY, async (req, res) => {
    res.json({ zone: await layout.updateZone(id(req.params), updateZoneInputSchema.parse(req.body), req.principal!) });
  });
  r.post("/zones/:id/archive", ADMIN_ONLY, async (req, res) => {
    res.json(await layout.archiveZone(id(req.params), req.principal!));
  });
  r.post("/zones/:id/restore", ADMIN_ONLY, async (req, res) => {
    res.json(await layout.restoreZone(id(req.params), req.principal!));
  });
  r.put("/zones/:id/bench-order", BENCH_EDITORS, async (req, res) => {
    res.json(await layout.reorderBenches(id(req.params), benchOrderInputSchema.parse(req.body).benchIds, req.principal!));
  });

  r.post("/benches", BENCH_EDITORS, async (req, res) => {
    res.status(201).json({ bench: await layout.createBench(createBenchInputSchema.parse(req.body), req.principal!) });
  });
  r.patch("/benches/:id", BENCH_EDITORS, async (req, res) => {
    res.json({ bench: await layout.updateBench(id(req.params), updateBenchInputSchema.parse(req.body), req.principal!) });
  });
  r.post("/benches/:id/archive", BENCH_EDITORS, async (req, res) => {
    res.json(await layout.archiveBench(id(req.params), req.principal!));
  });
  r.post("/benches/:id/restore", BENCH_EDITORS, async (req, res) => {
    res.json(await layout.restoreBench(id(req.params), req.principal!));
  });

  r.get("/benches/:id/assignments", EVERYONE_SIGNED_IN, async (req, res) => {
    const body: SensorAssignmentsResponse = { assignments: await sensors.assignmentsOfBench(id(req.params)) };
    res.json(body);
  });
  r.get("/sensors/:id/assignments", ADMIN_ONLY, async (req, res) => {
    const body: SensorAssignmentsResponse = { assignments: await sensors.assignmentsOfSensor(sensorParams.parse(req.params).id) };
    res.json(body);
  });
  r.post("/sensors/:id/assignments", ADMIN_ONLY, async (req, res) => {
    res.json(await sensors.assign(sensorParams.parse(req.params).id, assignSensorInputSchema.parse(req.body)));
  });

  return r.router;
}
