import { Router } from "express";
import { z } from "zod";
import { seriesQuerySchema } from "../../../shared/schemas/readings.js";
import { EVERYONE_SIGNED_IN, type RouteTable } from "../../lib/auth.js";
import type { ReadingsService } from "./readings.service.js";

const benchParamsSchema = z.object({ benchId: z.coerce.number().int().positive() });

export function readingsRoutes(table: RouteTable, readings: ReadingsService): Router {
  const r = table.router("/api", Router());
  r.get("/benches/:benchId/readings", EVERYONE_SIGNED_IN, async (req, res) => {
    const { benchId } = benchParamsSchema.parse(req.params);
    // A query given as plain milliseconds reads as a number, not a date string.
    const raw = Object.fromEntries(
      Object.entries(req.query).map(([k, v]) => [k, typeof v === "string" && /^\d+$/.test(v) ? Number(v) : v]),
    );
    res.json(await readings.benchSeries(benchId, seriesQuerySchema.parse(raw)));
  });
  return r.router;
}
