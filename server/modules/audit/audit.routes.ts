import { Router } from "express";
import { z } from "zod";
import { auditQuerySchema, type AuditResponse } from "../../../shared/schemas/audit.js";
import { EVERYONE_SIGNED_IN, type RouteTable } from "../../lib/auth.js";
import { notFound } from "../../lib/errors.js";
import type { AuditService } from "./audit.service.js";
import { rowIdParamSchema } from "../../../shared/schemas/ids.js";

const idParams = z.object({ id: rowIdParamSchema });

/** The audit trail, readable by every signed-in role (a viewer sees everything, changes nothing). */
export function auditRoutes(table: RouteTable, audit: AuditService): Router {
  const r = table.router("/api", Router());

  r.get("/audit", EVERYONE_SIGNED_IN, async (req, res) => {
    const body: AuditResponse = await audit.list(auditQuerySchema.parse(req.query));
    res.json(body);
  });

  r.get("/zones/:id/audit", EVERYONE_SIGNED_IN, async (req, res) => {
    const { id } = idParams.parse(req.params);
    if (!(await audit.zoneExists(id))) throw notFound("zone-not-found", `There is no zone ${id}`);
    const body: AuditResponse = await audit.list(auditQuerySchema.parse({ ...req.query, zoneId: id }));
    res.json(body);
  });

  return r.router;
}
