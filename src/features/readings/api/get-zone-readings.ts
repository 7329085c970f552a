import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { zoneReadingsResponseSchema, type ZoneReadingsResponse } from "../../../../shared/schemas/readings.js";
import { apiGet } from "../../../lib/api-client";
import { FALLBACK_REFETCH_MS } from "../../../lib/query-client";
import { DEFAULT_RANGE, rangeBounds, type ChartRange } from "../utils/chart-range";

export type ZoneReadingsParams = { zoneId: number; range?: ChartRange };

/** Every bench in use of a zone over one range, on one bucket grid (the same from, to and bucket width). */
export type ZoneReadings = ZoneReadingsResponse;

/**
 * GET /api/zones/:id/readings with an explicit from/to: each bench of the zone, in walking order,
 * as its own series, in one request, so their mean lines can be drawn on one chart.
 */
export function getZoneReadings({ zoneId, range = DEFAULT_RANGE }: ZoneReadingsParams, { signal }: { signal?: AbortSignal } = {}): Promise<ZoneReadings> {
  const { fromMs, toMs } = rangeBounds(range, Date.now());
  return apiGet(`/api/zones/${encodeURIComponent(zoneId)}/readings`, zoneReadingsResponseSchema, {
    signal,
    params: { from: new Date(fromMs).toISOString(), to: new Date(toMs).toISOString() },
  });
}

export function getZoneReadingsQueryOptions(params: ZoneReadingsParams) {
  const range = params.range ?? DEFAULT_RANGE;
  const rangeFilter = range.kind === "custom" ? { from: range.from, to: range.to } : { range: range.kind };
  return queryOptions({
    queryKey: ["readings", "zone", { zoneId: params.zoneId, ...rangeFilter }] as const,
    queryFn: ({ signal }) => getZoneReadings(params, { signal }),
    refetchInterval: range.kind === "24h" ? FALLBACK_REFETCH_MS : 5 * 60_000,
  });
}

export function useZoneReadings(params: ZoneReadingsParams) {
  return useSuspenseQuery(getZoneReadingsQueryOptions(params));
}
