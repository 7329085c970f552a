import { z } from "zod";
import { alertSchema } from "./alerts.js";
import { quantitySchema, sensorKindSchema } from "./quantities.js";
import { quantityWindowSchema, windowStatusSchema } from "./windows.js";

/** The newest stored value of one quantity on a bench. */
export const latestReadingSchema = z.object({
  quantity: quantitySchema,
  value: z.number(),
  /** Milliseconds since 1970-01-01 UTC. */
  timeMs: z.number(),
  sensorId: z.string(),
  status: windowStatusSchema,
});
export type LatestReading = z.infer<typeof latestReadingSchema>;

export const benchSummarySchema = z.object({
  id: z.number().int(),
  name: z.string(),
  zoneId: z.number().int(),
  position: z.number().int(),
  sensors: z.array(z.object({ id: z.string(), kind: sensorKindSchema, lastSeenMs: z.number().nullable() })),
  /** The window in force on this bench (zone window with any bench overrides applied). */
  windows: z.array(quantityWindowSchema),
  latest: z.array(latestReadingSchema),
  /** "inside" only when every windowed quantity with a value is inside. */
  status: windowStatusSchema,
  /** Alerts not yet cleared (watching, raised, acknowledged), oldest first. */
  alerts: z.array(alertSchema).optional(),
});
export type BenchSummary = z.infer<typeof benchSummarySchema>;

export const zoneSummarySchema = z.object({
  id: z.number().int(),
  name: z.string(),
  siteId: z.number().int(),
  siteName: z.string(),
  benches: z.array(benchSummarySchema),
});
export type ZoneSummary = z.infer<typeof zoneSummarySchema>;

/** GET /api/zones */
export const zonesResponseSchema = z.object({ zones: z.array(zoneSummarySchema) });
export type ZonesResponse = z.infer<typeof zonesResponseSchema>;
