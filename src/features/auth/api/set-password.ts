import { useMutation } from "@tanstack/react-query";
import type { SetPasswordInput } from "../../../../shared/schemas/auth.js";
import { apiSend } from "../../../lib/api-client";

/** POST /api/password-links/:token: sets the password; the link then stops working (410 afterwards). */
export function setPassword({ token, input }: { token: string; input: SetPasswordInput }): Promise<void> {
  return apiSend("POST", `/api/password-links/${encodeURIComponent(token)}`, undefined, { body: input });
}

export function useSetPassword() {
  return useMutation({ mutationFn: setPassword });
}
