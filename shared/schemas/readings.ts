import { z } from "zod";
import { quantitySchema } from "./quantities.js";
import { quantityWindowSchema } from "./windows.js";

/** Query of GET /api/benches/:id/readings and GET /api/zones/:id/readings. Times are ISO 8601 or milliseconds since 1970. */
export const seriesQuerySchema = z
  .object({
    from: z.coerce.date().optional(),
    to: z.coerce.date().optional(),
    quantity: quantitySchema.optional(),
  })
  .refine((q) => !q.from || !q.to || q.from < q.to, { message: "'from' must be before 'to'", path: ["from"] });
export type SeriesQuery = z.infer<typeof seriesQuerySchema>;

/** One time bucket of a series: the bucket's start and the min/mean/max of the values in it. */
export const seriesPointSchema = z.object({
  timeMs: z.number(),
  min: z.number(),
  mean: z.number(),
  max: z.number(),
  count: z.number().int(),
});
export type SeriesPoint = z.infer<typeof seriesPointSchema>;

export const benchSeriesSchema = z.object({
  quantity: quantitySchema,
  points: z.array(seriesPointSchema),
});

/** GET /api/benches/:id/readings */
export const benchReadingsResponseSchema = z.object({
  bench: z.object({ id: z.number().int(), name: z.string(), zoneId: z.number().int(), zoneName: z.string() }),
  fromMs: z.number(),
  toMs: z.number(),
  bucketMs: z.number(),
  windows: z.array(quantityWindowSchema),
  series: z.array(benchSeriesSchema),
});
export type BenchReadingsResponse = z.infer<typeof benchReadingsResponseSchema>;

/**
 * GET /api/zones/:id/readings (same query as a bench's): every bench in use of the zone, in walking
 * order, each exactly as GET /api/benches/:id/readings answers it, on one bucket grid.
 */
export const zoneReadingsResponseSchema = z.object({
  zone: z.object({ id: z.number().int(), name: z.string(), siteName: z.string() }),
  fromMs: z.number(),
  toMs: z.number(),
  bucketMs: z.number(),
  benches: z.array(benchReadingsResponseSchema),
});
export type ZoneReadingsResponse = z.infer<typeof zoneReadingsResponseSchema>;

/** The most buckets a series is cut into, so a 30-day chart stays small. */
export const MAX_SERIES_POINTS = 500;
