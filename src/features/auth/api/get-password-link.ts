import { queryOptions, useQuery } from "@tanstack/react-query";
import { passwordLinkResponseSchema, type PasswordLinkResponse } from "../../../../shared/schemas/auth.js";
import { apiGet } from "../../../lib/api-client";

/** GET /api/password-links/:token: whose link it is and what for; changes nothing. 410 link-not-valid. */
export function getPasswordLink(token: string, { signal }: { signal?: AbortSignal } = {}): Promise<PasswordLinkResponse> {
  return apiGet(`/api/password-links/${encodeURIComponent(token)}`, passwordLinkResponseSchema, { signal });
}

export function getPasswordLinkQueryOptions(token: string) {
  return queryOptions({
    queryKey: ["password-links", "detail", token] as const,
    queryFn: ({ signal }) => getPasswordLink(token, { signal }),
    // Asked once: after the password is set the same link answers 410, and the page should not flip.
    staleTime: Infinity,
    refetchOnWindowFocus: false,
    refetchOnReconnect: false,
    // The loader's answer stands, a 410 included: mounting the page does not ask again.
    retryOnMount: false,
  });
}

export function usePasswordLink(token: string) {
  return useQuery(getPasswordLinkQueryOptions(token));
}
