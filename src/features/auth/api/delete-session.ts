import { useMutation } from "@tanstack/react-query";
import { apiSend } from "../../../lib/api-client";

/** DELETE /api/session: signs out (the server clears the cookie). 204. */
export function deleteSession(): Promise<void> {
  return apiSend("DELETE", "/api/session");
}

/** The caller navigates away first and then empties the cache (see the user menu). */
export function useDeleteSession() {
  return useMutation({ mutationFn: deleteSession });
}
