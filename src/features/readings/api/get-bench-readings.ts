import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { benchReadingsResponseSchema, type BenchReadingsResponse } from "../../../../shared/schemas/readings.js";
import { apiGet } from "../../../lib/api-client";
import { FALLBACK_REFETCH_MS } from "../../../lib/query-client";

/** Without `from`/`to` the server answers the last 24 hours. Times are ISO 8601. */
export type BenchReadingsParams = { benchId: number; from?: string; to?: string };

/** GET /api/benches/:id/readings: min/mean/max buckets of every quantity, with the bench's windows. */
export function getBenchReadings(
  { benchId, from, to }: BenchReadingsParams,
  { signal }: { signal?: AbortSignal } = {},
): Promise<BenchReadingsResponse> {
  return apiGet(`/api/benches/${encodeURIComponent(benchId)}/readings`, benchReadingsResponseSchema, {
    signal,
    params: { from, to },
  });
}

export function getBenchReadingsQueryOptions(params: BenchReadingsParams) {
  const { benchId, from, to } = params;
  // Keys are general → specific; undefined bounds are left out so ['readings', 'series', { benchId }]
  // matches every range of that bench when invalidating.
  const filters = { benchId, ...(from !== undefined && { from }), ...(to !== undefined && { to }) };
  return queryOptions({
    queryKey: ["readings", "series", filters] as const,
    queryFn: ({ signal }) => getBenchReadings(params, { signal }),
    refetchInterval: FALLBACK_REFETCH_MS,
  });
}

export function useBenchReadings(params: BenchReadingsParams) {
  return useSuspenseQuery(getBenchReadingsQueryOptions(params));
}
