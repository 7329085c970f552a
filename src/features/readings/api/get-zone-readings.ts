import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { benchReadingsResponseSchema, type BenchReadingsResponse } from "../../../../shared/schemas/readings.js";
import { apiGet } from "../../../lib/api-client";
import { FALLBACK_REFETCH_MS } from "../../../lib/query-client";
import { DEFAULT_RANGE, rangeBounds, type ChartRange } from "../utils/chart-range";

export type ZoneReadingsParams = { zoneId: number; benchIds: readonly number[]; range?: ChartRange };

/** Every bench of a zone over one range, on one bucket grid (the same from, to and bucket width). */
export type ZoneReadings = { fromMs: number; toMs: number; bucketMs: number; benches: BenchReadingsResponse[] };

/**
 * The zone's history: GET /api/benches/:id/readings for each of its benches with the same explicit
 * from/to (the server has no zone series), so all benches share one bucket grid and their mean
 * lines can be drawn on one chart.
 */
export async function getZoneReadings({ benchIds, range = DEFAULT_RANGE }: ZoneReadingsParams, { signal }: { signal?: AbortSignal } = {}): Promise<ZoneReadings> {
  const { fromMs, toMs } = rangeBounds(range, Date.now());
  const params = { from: new Date(fromMs).toISOString(), to: new Date(toMs).toISOString() };
  const benches = await Promise.all(
    benchIds.map((benchId) => apiGet(`/api/benches/${encodeURIComponent(benchId)}/readings`, benchReadingsResponseSchema, { signal, params })),
  );
  const first = benches[0];
  return { fromMs: first?.fromMs ?? fromMs, toMs: first?.toMs ?? toMs, bucketMs: first?.bucketMs ?? 60_000, benches };
}

export function getZoneReadingsQueryOptions(params: ZoneReadingsParams) {
  const range = params.range ?? DEFAULT_RANGE;
  const rangeFilter = range.kind === "custom" ? { from: range.from, to: range.to } : { range: range.kind };
  return queryOptions({
    queryKey: ["readings", "zone", { zoneId: params.zoneId, benchIds: [...params.benchIds], ...rangeFilter }] as const,
    queryFn: ({ signal }) => getZoneReadings(params, { signal }),
    refetchInterval: range.kind === "24h" ? FALLBACK_REFETCH_MS : 5 * 60_000,
  });
}

export function useZoneReadings(params: ZoneReadingsParams) {
  return useSuspenseQuery(getZoneReadingsQueryOptions(params));
}
