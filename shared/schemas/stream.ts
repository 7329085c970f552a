import { z } from "zod";
import { quantitySchema } from "./quantities.js";
import { windowStatusSchema } from "./windows.js";

/** SSE event "reading" on GET /api/stream: one stored reading. */
export const readingEventSchema = z.object({
  benchId: z.number().int(),
  sensorId: z.string(),
  quantity: quantitySchema,
  value: z.number(),
  timeMs: z.number(),
  status: windowStatusSchema,
});
export type ReadingEvent = z.infer<typeof readingEventSchema>;

/** SSE event "readings": the readings of one committed batch (the server sends these, batched). */
export const readingsEventSchema = z.object({ readings: z.array(readingEventSchema) });
export type ReadingsEvent = z.infer<typeof readingsEventSchema>;
