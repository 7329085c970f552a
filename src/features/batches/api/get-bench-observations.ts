import { queryOptions, useQuery } from "@tanstack/react-query";
import { benchObservationsResponseSchema, type BenchObservationsResponse } from "../../../../shared/schemas/batches.js";
import { apiGet } from "../../../lib/api-client";
import { FALLBACK_REFETCH_MS } from "../../../lib/query-client";

/** Observations on one bench, or on every bench of a zone, made in [fromMs, toMs). */
export type BenchObservationsFilters = ({ benchId: number; zoneId?: never } | { zoneId: number; benchId?: never }) & { fromMs: number; toMs: number };

/** Every cached chart-marker list, whatever its filters: invalidated after a batch or an observation changes. */
export const BENCH_OBSERVATION_LISTS_KEY = ["batches", "observations", "on-benches"] as const;

/**
 * GET /api/observations: each observation on the bench its batch stood on when it was made, oldest
 * first (the history charts' markers).
 */
export function getBenchObservations(filters: BenchObservationsFilters, { signal }: { signal?: AbortSignal } = {}): Promise<BenchObservationsResponse> {
  return apiGet("/api/observations", benchObservationsResponseSchema, {
    signal,
    params: {
      benchId: filters.benchId?.toString(),
      zoneId: filters.zoneId?.toString(),
      fromMs: String(Math.floor(filters.fromMs)),
      toMs: String(Math.ceil(filters.toMs)),
    },
  });
}

export function getBenchObservationsQueryOptions(filters: BenchObservationsFilters) {
  const { benchId, zoneId, fromMs, toMs } = filters;
  const key = { ...(benchId !== undefined && { benchId }), ...(zoneId !== undefined && { zoneId }), fromMs, toMs };
  return queryOptions({
    queryKey: [...BENCH_OBSERVATION_LISTS_KEY, key] as const,
    queryFn: ({ signal }) => getBenchObservations(filters, { signal }),
    refetchInterval: FALLBACK_REFETCH_MS,
  });
}

/** The charts draw without waiting: markers appear when they arrive, and a failure only leaves them out. */
export function useBenchObservations(filters: BenchObservationsFilters) {
  return useQuery(getBenchObservationsQueryOptions(filters));
}
