import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { benchReadingsResponseSchema, type BenchReadingsResponse } from "../../../../shared/schemas/readings.js";
import { apiGet } from "../../../lib/api-client";
import { FALLBACK_REFETCH_MS } from "../../../lib/query-client";
import { rangeBounds, type ChartRange } from "../utils/chart-range";

/**
 * Without a range (or with 24 h) the server answers its own last 24 hours, as the live bench page
 * always has; 7 d and 30 d end at the moment of fetching; a custom range is whole local days.
 */
export type BenchReadingsParams = { benchId: number; range?: ChartRange };

/** How often a long range refetches by itself: its buckets are an hour wide, a minute adds nothing. */
const LONG_RANGE_REFETCH_MS = 5 * 60_000;

/** The query parameters of a range, in ISO 8601 (none for the server's default 24 h). */
export function benchReadingsSearch(range: ChartRange | undefined, nowMs: number): { from?: string; to?: string } {
  if (!range || range.kind === "24h") return {};
  const { fromMs, toMs } = rangeBounds(range, nowMs);
  return { from: new Date(fromMs).toISOString(), to: new Date(toMs).toISOString() };
}

/** GET /api/benches/:id/readings: min/mean/max buckets of every quantity (at most 500), with the bench's windows. */
export function getBenchReadings({ benchId, range }: BenchReadingsParams, { signal }: { signal?: AbortSignal } = {}): Promise<BenchReadingsResponse> {
  return apiGet(`/api/benches/${encodeURIComponent(benchId)}/readings`, benchReadingsResponseSchema, {
    signal,
    params: benchReadingsSearch(range, Date.now()),
  });
}

/** The key's filters: `{ benchId }` for the default day, plus `range` for 7 d / 30 d, plus `from`/`to` days for a custom range. */
function readingsFilters({ benchId, range }: BenchReadingsParams) {
  if (!range || range.kind === "24h") return { benchId };
  if (range.kind === "custom") return { benchId, from: range.from, to: range.to };
  return { benchId, range: range.kind };
}

export function getBenchReadingsQueryOptions(params: BenchReadingsParams) {
  // Keys are general → specific; ['readings', 'series', { benchId }] matches every range of that
  // bench when invalidating (TanStack matches object keys partially).
  const filters = readingsFilters(params);
  const isLong = params.range !== undefined && params.range.kind !== "24h";
  return queryOptions({
    queryKey: ["readings", "series", filters] as const,
    queryFn: ({ signal }) => getBenchReadings(params, { signal }),
    refetchInterval: isLong ? LONG_RANGE_REFETCH_MS : FALLBACK_REFETCH_MS,
  });
}

export function useBenchReadings(params: BenchReadingsParams) {
  return useSuspenseQuery(getBenchReadingsQueryOptions(params));
}
