import { Router } from "express";
import { z } from "zod";
import { dutyShiftInputSchema, siteAlertTimingInputSchema } from "../../../shared/schemas/alerts.js";
import { EVERYONE_SIGNED_IN, type RouteTable } from "../../lib/auth.js";
import type { RotaService } from "./rota.service.js";
import { rowIdParamSchema } from "../../../shared/schemas/ids.js";

const idParams = z.object({ id: rowIdParamSchema });
/** The rota and when the managers are told are the manager's to set (PRODUCT.md §5), and the admin's. */
const ROTA_EDITORS = ["admin", "manager"] as const;

export function rotaRoutes(table: RouteTable, rota: RotaService): Router {
  const r = table.router("/api", Router());
  r.get("/duty-rota", EVERYONE_SIGNED_IN, async (_req, res) => {
    res.json(await rota.rota());
  });
  r.get("/duty-rota/candidates", ROTA_EDITORS, async (_req, res) => {
    res.json({ users: await rota.candidates() });
  });
  r.post("/duty-rota/shifts", ROTA_EDITORS, async (req, res) => {
    res.status(201).json({ shift: await rota.create(dutyShiftInputSchema.parse(req.body), req.principal!) });
  });
  r.put("/duty-rota/shifts/:id", ROTA_EDITORS, async (req, res) => {
    res.json({ shift: await rota.replace(idParams.parse(req.params).id, dutyShiftInputSchema.parse(req.body), req.principal!) });
  });
  r.delete("/duty-rota/shifts/:id", ROTA_EDITORS, async (req, res) => {
    await rota.remove(idParams.parse(req.params).id, req.principal!);
    res.status(204).end();
  });
  r.put("/sites/:id/alert-timing", ROTA_EDITORS, async (req, res) => {
    const { id } = idParams.parse(req.params);
    res.json({ alertTiming: await rota.setAlertTiming(id, siteAlertTimingInputSchema.parse(req.body), req.principal!) });
  });
  return r.router;
}
