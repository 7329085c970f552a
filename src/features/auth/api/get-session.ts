import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { sessionResponseSchema, type SessionResponse } from "../../../../shared/schemas/auth.js";
import { apiGet } from "../../../lib/api-client";

/** GET /api/session: the signed-in user and when the session ends; 401 when nobody is signed in. */
export function getSession({ signal }: { signal?: AbortSignal } = {}): Promise<SessionResponse> {
  return apiGet("/api/session", sessionResponseSchema, { signal });
}

/** How often the session is checked again while the app is open (a disabled user is noticed). */
export const SESSION_RECHECK_MS = 5 * 60_000;

export function getSessionQueryOptions() {
  return queryOptions({
    queryKey: ["session"] as const,
    queryFn: ({ signal }) => getSession({ signal }),
    staleTime: SESSION_RECHECK_MS,
    refetchInterval: SESSION_RECHECK_MS,
  });
}

/** The session, already loaded by the signed-in layout's loader. */
export function useSession() {
  return useSuspenseQuery(getSessionQueryOptions());
}
