import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { z } from "zod";
import { alertSchema } from "../../../../shared/schemas/alerts.js";
import { apiGet } from "../../../lib/api-client";
import { FALLBACK_REFETCH_MS } from "../../../lib/query-client";

const alertResponseSchema = z.object({ alert: alertSchema });

/** GET /api/alerts/:id: one alert with every field. 404 alert-not-found. */
export function getAlert(alertId: number, { signal }: { signal?: AbortSignal } = {}) {
  return apiGet(`/api/alerts/${encodeURIComponent(alertId)}`, alertResponseSchema, { signal });
}

export function getAlertQueryOptions(alertId: number) {
  return queryOptions({
    queryKey: ["alerts", "detail", alertId] as const,
    queryFn: ({ signal }) => getAlert(alertId, { signal }),
    refetchInterval: FALLBACK_REFETCH_MS,
  });
}

export function useAlert(alertId: number) {
  return useSuspenseQuery(getAlertQueryOptions(alertId));
}
