import { z } from "zod";
import { quantitySchema } from "./quantities.js";

/** One quantity's rooting window, in stored (SI) units. */
export const quantityWindowSchema = z
  .object({
    quantity: quantitySchema,
    min: z.number().finite(),
    max: z.number().finite(),
    /** How long a value must stay out before an alert is raised. */
    delayS: z.number().int().min(0).max(24 * 3600),
    /** How far back inside the window a value must come before an alert clears. */
    hysteresis: z.number().min(0),
  })
  .refine((w) => w.min < w.max, { message: "The minimum must be below the maximum", path: ["min"] });
export type QuantityWindow = z.infer<typeof quantityWindowSchema>;

/** Where a value stands against its window. */
export const windowStatusSchema = z.enum(["inside", "below", "above", "unknown"]);
export type WindowStatus = z.infer<typeof windowStatusSchema>;
