import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { zonesResponseSchema, type ZonesResponse } from "../../../../shared/schemas/zones.js";
import { apiGet } from "../../../lib/api-client";
import { FALLBACK_REFETCH_MS } from "../../../lib/query-client";

/** GET /api/zones: every zone with its benches and each bench's latest value per quantity. */
export function getZones({ signal }: { signal?: AbortSignal } = {}): Promise<ZonesResponse> {
  return apiGet("/api/zones", zonesResponseSchema, { signal });
}

export function getZonesQueryOptions() {
  return queryOptions({
    queryKey: ["zones", "list"] as const,
    queryFn: ({ signal }) => getZones({ signal }),
    // The live stream patches this query (see app/live-updates.ts); the interval is the fallback.
    refetchInterval: FALLBACK_REFETCH_MS,
  });
}

export function useZones() {
  return useSuspenseQuery(getZonesQueryOptions());
}
