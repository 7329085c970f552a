import { Router } from "express";
import { z } from "zod";
import {
  checkBenchInputSchema,
  roundsQuerySchema,
  startRoundInputSchema,
  type BenchCardResponse,
  type CheckBenchResponse,
  type RoundCardsResponse,
  type RoundResponse,
  type RoundsResponse,
  type RoundSummaryResponse,
  type StartRoundResponse,
} from "../../../shared/schemas/rounds.js";
import { EVERYONE_SIGNED_IN, type RouteTable } from "../../lib/auth.js";
import { BATCH_RECORDERS, idParams } from "../batches/batches.routes.js";
import type { RoundsService } from "./rounds.service.js";
import { rowIdParamSchema } from "../../../shared/schemas/ids.js";

const benchParams = z.object({ id: rowIdParamSchema, benchId: rowIdParamSchema });

/** Walk-throughs: walked by growers, managers and admins; read by every signed-in role. */
export function roundsRoutes(table: RouteTable, rounds: RoundsService): Router {
  const r = table.router("/api", Router());
  const id = (params: unknown) => idParams.parse(params).id;

  r.get("/rounds", EVERYONE_SIGNED_IN, async (req, res) => {
    const body: RoundsResponse = { rounds: await rounds.list(roundsQuerySchema.parse(req.query)) };
    res.json(body);
  });
  // 201 for a new round, 200 when the scope's round in progress is resumed.
  r.post("/rounds", BATCH_RECORDERS, async (req, res) => {
    const body: StartRoundResponse = await rounds.start(startRoundInputSchema.parse(req.body), req.principal!);
    res.status(body.resumed ? 200 : 201).json(body);
  });
  r.get("/rounds/:id", EVERYONE_SIGNED_IN, async (req, res) => {
    const body: RoundResponse = { round: await rounds.get(id(req.params)) };
    res.json(body);
  });
  r.get("/rounds/:id/cards", EVERYONE_SIGNED_IN, async (req, res) => {
    const body: RoundCardsResponse = await rounds.cards(id(req.params));
    res.json(body);
  });
  r.get("/rounds/:id/benches/:benchId/card", EVERYONE_SIGNED_IN, async (req, res) => {
    const { id: roundId, benchId } = benchParams.parse(req.params);
    const body: BenchCardResponse = { card: await rounds.card(roundId, benchId) };
    res.json(body);
  });
  r.put("/rounds/:id/benches/:benchId/check", BATCH_RECORDERS, async (req, res) => {
    const { id: roundId, benchId } = benchParams.parse(req.params);
    const body: CheckBenchResponse = await rounds.check(roundId, benchId, checkBenchInputSchema.parse(req.body ?? {}), req.principal!);
    res.json(body);
  });
  r.delete("/rounds/:id/benches/:benchId/check", BATCH_RECORDERS, async (req, res) => {
    const { id: roundId, benchId } = benchParams.parse(req.params);
    const body: CheckBenchResponse = await rounds.uncheck(roundId, benchId);
    res.json(body);
  });
  r.post("/rounds/:id/finish", BATCH_RECORDERS, async (req, res) => {
    const body: RoundSummaryResponse = await rounds.finish(id(req.params), req.principal!);
    res.json(body);
  });
  r.post("/rounds/:id/abandon", BATCH_RECORDERS, async (req, res) => {
    const body: RoundResponse = { round: await rounds.abandon(id(req.params)) };
    res.json(body);
  });
  r.get("/rounds/:id/summary", EVERYONE_SIGNED_IN, async (req, res) => {
    const body: RoundSummaryResponse = await rounds.summary(id(req.params));
    res.json(body);
  });

  return r.router;
}
