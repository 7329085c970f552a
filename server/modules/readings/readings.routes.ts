import { Router } from "express";
import { z } from "zod";
import { seriesQuerySchema, type SeriesQuery } from "../../../shared/schemas/readings.js";
import { EVERYONE_SIGNED_IN, type RouteTable } from "../../lib/auth.js";
import type { ReadingsService } from "./readings.service.js";
import { rowIdParamSchema } from "../../../shared/schemas/ids.js";

const benchParamsSchema = z.object({ benchId: rowIdParamSchema });
const zoneParamsSchema = z.object({ id: rowIdParamSchema });

/** A query given as plain milliseconds reads as a number, not a date string. */
function seriesQuery(query: Record<string, unknown>): SeriesQuery {
  const raw = Object.fromEntries(Object.entries(query).map(([k, v]) => [k, typeof v === "string" && /^\d+$/.test(v) ? Number(v) : v]));
  return seriesQuerySchema.parse(raw);
}

export function readingsRoutes(table: RouteTable, readings: ReadingsService): Router {
  const r = table.router("/api", Router());
  r.get("/benches/:benchId/readings", EVERYONE_SIGNED_IN, async (req, res) => {
    const { benchId } = benchParamsSchema.parse(req.params);
    res.json(await readings.benchSeries(benchId, seriesQuery(req.query)));
  });
  r.get("/zones/:id/readings", EVERYONE_SIGNED_IN, async (req, res) => {
    const { id } = zoneParamsSchema.parse(req.params);
    res.json(await readings.zoneSeries(id, seriesQuery(req.query)));
  });
  return r.router;
}
