import { Router } from "express";
import { z } from "zod";
import type { Role } from "../../../shared/schemas/auth.js";
import {
  batchesQuerySchema,
  closeBatchInputSchema,
  createBatchInputSchema,
  moveBatchInputSchema,
  updateBatchInputSchema,
  type BatchesResponse,
  type BatchResponse,
} from "../../../shared/schemas/batches.js";
import { EVERYONE_SIGNED_IN, type RouteTable } from "../../lib/auth.js";
import type { BatchesService } from "./batches.service.js";
import { rowIdParamSchema } from "../../../shared/schemas/ids.js";

/**
 * Who records batches, observations, photos and walk-throughs (PRODUCT.md §3): growers, and the
 * managers and admins above them. Viewers read everything.
 */
export const BATCH_RECORDERS: readonly Role[] = ["admin", "manager", "grower"];

export const idParams = z.object({ id: rowIdParamSchema });

export function batchesRoutes(table: RouteTable, batches: BatchesService): Router {
  const r = table.router("/api", Router());
  const id = (params: unknown) => idParams.parse(params).id;

  r.get("/batches", EVERYONE_SIGNED_IN, async (req, res) => {
    const body: BatchesResponse = { batches: await batches.list(batchesQuerySchema.parse(req.query)) };
    res.json(body);
  });
  r.post("/batches", BATCH_RECORDERS, async (req, res) => {
    const body: BatchResponse = { batch: await batches.create(createBatchInputSchema.parse(req.body), req.principal!) };
    res.status(201).json(body);
  });
  r.get("/batches/:id", EVERYONE_SIGNED_IN, async (req, res) => {
    const body: BatchResponse = { batch: await batches.get(id(req.params)) };
    res.json(body);
  });
  r.patch("/batches/:id", BATCH_RECORDERS, async (req, res) => {
    const body: BatchResponse = { batch: await batches.update(id(req.params), updateBatchInputSchema.parse(req.body), req.principal!) };
    res.json(body);
  });
  r.post("/batches/:id/move", BATCH_RECORDERS, async (req, res) => {
    const body: BatchResponse = { batch: await batches.move(id(req.params), moveBatchInputSchema.parse(req.body), req.principal!) };
    res.json(body);
  });
  r.post("/batches/:id/close", BATCH_RECORDERS, async (req, res) => {
    const body: BatchResponse = { batch: await batches.close(id(req.params), closeBatchInputSchema.parse(req.body), req.principal!) };
    res.json(body);
  });
  r.post("/batches/:id/reopen", BATCH_RECORDERS, async (req, res) => {
    const body: BatchResponse = { batch: await batches.reopen(id(req.params), req.principal!) };
    res.json(body);
  });

  return r.router;
}
