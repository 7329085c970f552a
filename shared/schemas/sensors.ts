import { z } from "zod";
import { sensorKindSchema } from "./quantities.js";

/** Sensor ids are MQTT user names and topic levels: letters, digits, - and _ only. */
export const sensorIdSchema = z
  .string()
  .trim()
  .min(3, "Use at least 3 characters")
  .max(64, "Use at most 64 characters")
  .regex(/^[A-Za-z0-9][A-Za-z0-9_-]*$/, "Use letters, digits, - and _ only, starting with a letter or digit");

/** A sensor as the admin sees it; never its secret or the secret's hash. */
export const sensorSchema = z.object({
  id: sensorIdSchema,
  kind: sensorKindSchema,
  benchId: z.number().int().nullable(),
  benchName: z.string().nullable(),
  zoneName: z.string().nullable(),
  disabled: z.boolean(),
  createdAtMs: z.number(),
  lastSeenMs: z.number().nullable(),
  batteryPct: z.number().nullable(),
});
export type SensorView = z.infer<typeof sensorSchema>;

export const sensorsResponseSchema = z.object({ sensors: z.array(sensorSchema) });

/** POST /api/sensors (admin) */
export const registerSensorInputSchema = z.object({
  id: sensorIdSchema,
  kind: sensorKindSchema,
  benchId: z.number().int().positive().nullable(),
});
export type RegisterSensorInput = z.infer<typeof registerSensorInputSchema>;

/** PATCH /api/sensors/:id (admin) */
export const updateSensorInputSchema = z
  .object({ benchId: z.number().int().positive().nullable().optional(), disabled: z.boolean().optional() })
  .refine((v) => v.benchId !== undefined || v.disabled !== undefined, { message: "Nothing to change" });
export type UpdateSensorInput = z.infer<typeof updateSensorInputSchema>;

/** The answer to a registration or a rotation: the only time the secret is ever shown. */
export const sensorSecretResponseSchema = z.object({ sensor: sensorSchema, secret: z.string() });
export type SensorSecretResponse = z.infer<typeof sensorSecretResponseSchema>;
