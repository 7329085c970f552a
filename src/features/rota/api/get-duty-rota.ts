import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { dutyRotaResponseSchema, type DutyRotaResponse } from "../../../../shared/schemas/alerts.js";
import { apiGet } from "../../../lib/api-client";
import { FALLBACK_REFETCH_MS } from "../../../lib/query-client";

/** GET /api/duty-rota (every role): the shifts, who is on duty now per zone, the site's time zone. */
export function getDutyRota({ signal }: { signal?: AbortSignal } = {}): Promise<DutyRotaResponse> {
  return apiGet("/api/duty-rota", dutyRotaResponseSchema, { signal });
}

export function getDutyRotaQueryOptions() {
  return queryOptions({
    queryKey: ["duty-rota"] as const,
    queryFn: ({ signal }) => getDutyRota({ signal }),
    // "On duty now" moves with the clock.
    refetchInterval: FALLBACK_REFETCH_MS,
  });
}

export function useDutyRota() {
  return useSuspenseQuery(getDutyRotaQueryOptions());
}
