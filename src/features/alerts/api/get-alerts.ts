import { queryOptions, useQuery, useSuspenseQuery } from "@tanstack/react-query";
import { alertsResponseSchema, type AlertKind, type AlertPhase } from "../../../../shared/schemas/alerts.js";
import { apiGet } from "../../../lib/api-client";
import { FALLBACK_REFETCH_MS } from "../../../lib/query-client";

/** The filters of GET /api/alerts; `phase`, when given, wins over `status` on the server. */
export type AlertFilters = {
  status: "open" | "past" | "all";
  zoneId?: number;
  kind?: AlertKind;
  phase?: AlertPhase;
  benchId?: number;
  /** Alerts open at some moment of [fromMs, toMs). */
  fromMs?: number;
  toMs?: number;
  limit?: number;
};

/** Enough for every open alert of a large site; the count in the navigation is this list's length. */
export const OPEN_ALERTS_LIMIT = 500;

/** GET /api/alerts: newest first. */
export function getAlerts({ status, zoneId, kind, phase, benchId, fromMs, toMs, limit }: AlertFilters, { signal }: { signal?: AbortSignal } = {}) {
  return apiGet("/api/alerts", alertsResponseSchema, {
    signal,
    params: {
      status,
      zoneId: zoneId?.toString(),
      kind,
      phase,
      benchId: benchId?.toString(),
      fromMs: fromMs?.toString(),
      toMs: toMs?.toString(),
      limit: limit?.toString(),
    },
  });
}

/** Every cached alert list, whatever its filters (the stream patches them all). */
export const ALERT_LISTS_KEY = ["alerts", "list"] as const;

export function getAlertsQueryOptions(filters: AlertFilters) {
  const { status, zoneId, kind, phase, benchId, fromMs, toMs, limit } = filters;
  // Undefined filters are left out, so equal filters always give equal keys.
  const key = {
    status,
    ...(zoneId !== undefined && { zoneId }),
    ...(kind !== undefined && { kind }),
    ...(phase !== undefined && { phase }),
    ...(benchId !== undefined && { benchId }),
    ...(fromMs !== undefined && { fromMs }),
    ...(toMs !== undefined && { toMs }),
    ...(limit !== undefined && { limit }),
  };
  return queryOptions({
    queryKey: [...ALERT_LISTS_KEY, key] as const,
    queryFn: ({ signal }) => getAlerts(filters, { signal }),
    // The stream's "alerts" events patch these lists (app/live-updates.ts); the interval is the fallback.
    refetchInterval: FALLBACK_REFETCH_MS,
  });
}

export function useAlerts(filters: AlertFilters) {
  return useSuspenseQuery(getAlertsQueryOptions(filters));
}

/** The open alerts for the navigation's count: never suspends, and a failure just hides the count. */
export function useOpenAlerts() {
  return useQuery(getAlertsQueryOptions({ status: "open", limit: OPEN_ALERTS_LIMIT }));
}
