import { useMutation, useQueryClient } from "@tanstack/react-query";
import { sessionResponseSchema, type SessionResponse, type SignInInput } from "../../../../shared/schemas/auth.js";
import { apiSend } from "../../../lib/api-client";
import { getSessionQueryOptions } from "./get-session";

/** POST /api/session: signs in; the server sets the session cookie. 401 invalid-credentials, 429 too-many-sign-in-attempts. */
export function createSession(input: SignInInput): Promise<SessionResponse> {
  return apiSend("POST", "/api/session", sessionResponseSchema, { body: input });
}

export function useCreateSession() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createSession,
    onSuccess: (session) => {
      // Nothing cached for someone who signed in before on this browser may show through.
      queryClient.removeQueries();
      queryClient.setQueryData(getSessionQueryOptions().queryKey, session);
    },
  });
}
