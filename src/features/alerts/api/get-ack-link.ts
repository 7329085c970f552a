import { queryOptions, useQuery } from "@tanstack/react-query";
import { ackLinkResponseSchema, type AckLinkResponse } from "../../../../shared/schemas/alerts.js";
import { apiGet } from "../../../lib/api-client";

/**
 * GET /api/ack-links/:token: who the e-mailed link is for and its alerts. Changes nothing (mail
 * scanners open links too). 410 link-not-valid when expired or broken.
 */
export function getAckLink(token: string, { signal }: { signal?: AbortSignal } = {}): Promise<AckLinkResponse> {
  return apiGet(`/api/ack-links/${encodeURIComponent(token)}`, ackLinkResponseSchema, { signal });
}

export function getAckLinkQueryOptions(token: string) {
  return queryOptions({
    queryKey: ["ack-links", "detail", token] as const,
    queryFn: ({ signal }) => getAckLink(token, { signal }),
    // Read once when the page opens; the page shows the acknowledgement's own answer after the tap.
    staleTime: Infinity,
    refetchOnWindowFocus: false,
    refetchOnReconnect: false,
    retryOnMount: false,
  });
}

export function useAckLink(token: string) {
  return useQuery(getAckLinkQueryOptions(token));
}
