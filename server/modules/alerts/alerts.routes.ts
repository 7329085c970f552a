import { Router } from "express";
import { z } from "zod";
import { acknowledgeInputSchema, alertsQuerySchema } from "../../../shared/schemas/alerts.js";
import { EVERYONE_SIGNED_IN, type RouteTable } from "../../lib/auth.js";
import type { AlertsService } from "./alerts.service.js";
import { rowIdParamSchema } from "../../../shared/schemas/ids.js";

const idParams = z.object({ id: rowIdParamSchema });
const tokenParams = z.object({ token: z.string().min(10).max(4000) });

/** Roles that may say "I've got it" (PRODUCT.md §3: growers acknowledge; managers and admins can too). */
export const ACKNOWLEDGERS = ["admin", "manager", "grower"] as const;

export function alertsRoutes(table: RouteTable, alerts: AlertsService): Router {
  const r = table.router("/api", Router());

  r.get("/alerts", EVERYONE_SIGNED_IN, async (req, res) => {
    res.json({ alerts: await alerts.list(alertsQuerySchema.parse(req.query)) });
  });
  r.get("/alerts/:id", EVERYONE_SIGNED_IN, async (req, res) => {
    res.json({ alert: await alerts.get(idParams.parse(req.params).id) });
  });
  r.post("/alerts/:id/acknowledge", ACKNOWLEDGERS, async (req, res) => {
    const { note } = acknowledgeInputSchema.parse(req.body ?? {});
    res.json({ alert: await alerts.acknowledge(idParams.parse(req.params).id, req.principal!.userId, note) });
  });

  // The e-mailed link: GET shows, POST acknowledges. No sign-in: the signed token is the proof.
  r.get("/ack-links/:token", "public", async (req, res) => {
    res.json(await alerts.describeLink(tokenParams.parse(req.params).token));
  });
  r.post("/ack-links/:token", "public", async (req, res) => {
    const { note } = acknowledgeInputSchema.parse(req.body ?? {});
    res.json(await alerts.acknowledgeWithLink(tokenParams.parse(req.params).token, note));
  });
  return r.router;
}
