import { z } from "zod";

/** A message the local SMTP sink caught (demo mode and tests), as an admin reads it in the app. */
export const caughtMailSchema = z.object({
  id: z.number().int(),
  receivedAtMs: z.number(),
  from: z.string(),
  to: z.array(z.string()),
  subject: z.string(),
  text: z.string(),
});
export type CaughtMail = z.infer<typeof caughtMailSchema>;

export const caughtMailResponseSchema = z.object({ messages: z.array(caughtMailSchema) });
