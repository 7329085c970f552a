import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { benchReadingsResponseSchema, type BenchReadingsResponse } from "../../../../shared/schemas/readings.js";
import { apiGet } from "../../../lib/api-client";
import { FALLBACK_REFETCH_MS } from "../../../lib/query-client";

/**
 * A bench's series between two instants (an alert's excursion with some time either side).
 * Without `toMs` the series runs up to the moment of fetching, so a refetch moves it forward.
 */
export type BenchReadingsBetweenParams = { benchId: number; fromMs: number; toMs?: number };

/** GET /api/benches/:id/readings?from&to (ISO 8601): min/mean/max buckets of every quantity, with the bench's windows. */
export function getBenchReadingsBetween(
  { benchId, fromMs, toMs }: BenchReadingsBetweenParams,
  { signal }: { signal?: AbortSignal } = {},
): Promise<BenchReadingsResponse> {
  return apiGet(`/api/benches/${encodeURIComponent(benchId)}/readings`, benchReadingsResponseSchema, {
    signal,
    params: { from: new Date(fromMs).toISOString(), to: toMs === undefined ? undefined : new Date(toMs).toISOString() },
  });
}

export function getBenchReadingsBetweenQueryOptions(params: BenchReadingsBetweenParams) {
  const { benchId, fromMs, toMs } = params;
  // Under ['readings', 'series', { benchId }], so the live stream's refresh of a bench covers it too.
  const filters = { benchId, fromMs, ...(toMs !== undefined && { toMs }) };
  return queryOptions({
    queryKey: ["readings", "series", filters] as const,
    queryFn: ({ signal }) => getBenchReadingsBetween(params, { signal }),
    refetchInterval: toMs === undefined ? FALLBACK_REFETCH_MS : false,
  });
}

export function useBenchReadingsBetween(params: BenchReadingsBetweenParams) {
  return useSuspenseQuery(getBenchReadingsBetweenQueryOptions(params));
}
