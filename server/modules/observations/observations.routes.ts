import { Router } from "express";
import {
  benchObservationsQuerySchema,
  createObservationInputSchema,
  updateObservationInputSchema,
  type BenchObservationsResponse,
  type CreateObservationResponse,
  type ObservationResponse,
  type ObservationsResponse,
} from "../../../shared/schemas/batches.js";
import { EVERYONE_SIGNED_IN, type RouteTable } from "../../lib/auth.js";
import { BATCH_RECORDERS, idParams } from "../batches/batches.routes.js";
import type { ObservationsService } from "./observations.service.js";

/** Observations: recorded by growers, managers and admins; read by every signed-in role. */
export function observationsRoutes(table: RouteTable, observations: ObservationsService): Router {
  const r = table.router("/api", Router());
  const id = (params: unknown) => idParams.parse(params).id;

  r.get("/batches/:id/observations", EVERYONE_SIGNED_IN, async (req, res) => {
    const body: ObservationsResponse = { observations: await observations.listForBatch(id(req.params)) };
    res.json(body);
  });
  // Idempotent on clientId: 201 when stored now, 200 with the stored one when it was sent before.
  r.post("/batches/:id/observations", BATCH_RECORDERS, async (req, res) => {
    const batchId = id(req.params);
    const body: CreateObservationResponse = await observations.create(batchId, createObservationInputSchema.parse(req.body), req.principal!);
    res.status(body.created ? 201 : 200).json(body);
  });
  // On a bench or a zone's benches over a range: the history charts' markers.
  r.get("/observations", EVERYONE_SIGNED_IN, async (req, res) => {
    const body: BenchObservationsResponse = await observations.onBenches(benchObservationsQuerySchema.parse(req.query));
    res.json(body);
  });
  r.get("/observations/:id", EVERYONE_SIGNED_IN, async (req, res) => {
    const body: ObservationResponse = { observation: await observations.get(id(req.params)) };
    res.json(body);
  });
  r.patch("/observations/:id", BATCH_RECORDERS, async (req, res) => {
    const body: ObservationResponse = { observation: await observations.update(id(req.params), updateObservationInputSchema.parse(req.body)) };
    res.json(body);
  });
  r.delete("/observations/:id", BATCH_RECORDERS, async (req, res) => {
    await observations.delete(id(req.params));
    res.status(204).end();
  });

  return r.router;
}
