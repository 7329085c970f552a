import { useMutation } from "@tanstack/react-query";
import type { z } from "zod";
import type { requestPasswordResetInputSchema } from "../../../../shared/schemas/auth.js";
import { apiSend } from "../../../lib/api-client";

export type RequestPasswordResetInput = z.infer<typeof requestPasswordResetInputSchema>;

/** POST /api/password-resets: 202 for every address, known or not, so the answer reveals nothing. */
export function requestPasswordReset(input: RequestPasswordResetInput): Promise<void> {
  return apiSend("POST", "/api/password-resets", undefined, { body: input });
}

export function useRequestPasswordReset() {
  return useMutation({ mutationFn: requestPasswordReset });
}
