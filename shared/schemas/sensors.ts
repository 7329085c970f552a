import { z } from "zod";
import { rowIdSchema } from "./ids.js";
import { CALIBRATION_GAIN_RANGE, MAX_CALIBRATION_OFFSET } from "../domain/calibration.js";
import { sensorKindSchema, type WindowedQuantity } from "./quantities.js";

/** Sensor ids are MQTT user names and topic levels: letters, digits, - and _ only. */
export const sensorIdSchema = z
  .string()
  .trim()
  .min(3, "Use at least 3 characters")
  .max(64, "Use at most 64 characters")
  .regex(/^[A-Za-z0-9][A-Za-z0-9_-]*$/, "Use letters, digits, - and _ only, starting with a letter or digit");

const OFFSET_WORDS: Record<WindowedQuantity, (limit: number) => string> = {
  "air.temperature": (l) => `${l} °C (${l * 1.8} °F)`,
  "air.humidity": (l) => `${l} % RH`,
  "medium.temperature": (l) => `${l} °C (${l * 1.8} °F)`,
  "medium.moisture": (l) => `${Math.round(l * 100)} % VWC`,
};

function calibrationOf(quantity: WindowedQuantity) {
  const limit = MAX_CALIBRATION_OFFSET[quantity];
  return z.object({
    offset: z
      .number({ error: "Enter a number" })
      .refine(Number.isFinite, "Enter a number")
      .refine((v) => Math.abs(v) <= limit + 1e-9, `An offset beyond ±${OFFSET_WORDS[quantity](limit)} means the probe is faulty: replace it`),
    gain: z
      .number({ error: "Enter a number" })
      .refine(Number.isFinite, "Enter a number")
      .refine(
        (v) => v >= CALIBRATION_GAIN_RANGE.min && v <= CALIBRATION_GAIN_RANGE.max,
        `Use a gain from ${CALIBRATION_GAIN_RANGE.min} to ${CALIBRATION_GAIN_RANGE.max} (1 = none)`,
      ),
  });
}

/**
 * A sensor's calibration in stored units (°C, % RH, m³/m³): calibrated = gain × measured + offset,
 * per quantity; a quantity left out is read as measured (shared/domain/calibration.ts).
 */
export const sensorCalibrationSchema = z.object({
  "air.temperature": calibrationOf("air.temperature").optional(),
  "air.humidity": calibrationOf("air.humidity").optional(),
  "medium.temperature": calibrationOf("medium.temperature").optional(),
  "medium.moisture": calibrationOf("medium.moisture").optional(),
});
export type SensorCalibrationInput = z.infer<typeof sensorCalibrationSchema>;

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
  calibration: sensorCalibrationSchema,
});
export type SensorView = z.infer<typeof sensorSchema>;

export const sensorsResponseSchema = z.object({ sensors: z.array(sensorSchema) });

/** POST /api/sensors (admin) */
export const registerSensorInputSchema = z.object({
  id: sensorIdSchema,
  kind: sensorKindSchema,
  benchId: rowIdSchema.nullable(),
});
export type RegisterSensorInput = z.infer<typeof registerSensorInputSchema>;

/** PATCH /api/sensors/:id (admin) */
export const updateSensorInputSchema = z
  .object({
    benchId: rowIdSchema.nullable().optional(),
    disabled: z.boolean().optional(),
    /** Replaces the whole calibration; {} reads every quantity as measured. */
    calibration: sensorCalibrationSchema.optional(),
  })
  .refine((v) => v.benchId !== undefined || v.disabled !== undefined || v.calibration !== undefined, { message: "Nothing to change" });
export type UpdateSensorInput = z.infer<typeof updateSensorInputSchema>;

/** The answer to a registration or a rotation: the only time the secret is ever shown. */
export const sensorSecretResponseSchema = z.object({ sensor: sensorSchema, secret: z.string() });
export type SensorSecretResponse = z.infer<typeof sensorSecretResponseSchema>;
