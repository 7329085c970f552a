import { z } from "zod";
import { STORED_UNIT, quantitySchema } from "../../shared/schemas/quantities.js";

/** A well-formed probe pack as PRODUCT.md §4 describes it, strictly: only the fields this simulator writes. */
const recordSchema = z
  .object({
    bn: z.string().optional(),
    bt: z.number().optional(),
    n: quantitySchema,
    u: z.string(),
    v: z.number().finite(),
    t: z.number().optional(),
  })
  .strict()
  .refine((r) => r.u === STORED_UNIT[r.n], { message: "unit does not match the quantity" });
export const packSchema = z.array(recordSchema).min(1);
