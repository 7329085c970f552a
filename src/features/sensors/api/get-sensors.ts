import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { sensorsResponseSchema } from "../../../../shared/schemas/sensors.js";
import { apiGet } from "../../../lib/api-client";
import { FALLBACK_REFETCH_MS } from "../../../lib/query-client";

/** GET /api/sensors (admin): every registered probe with its bench, last reading time and battery. */
export function getSensors({ signal }: { signal?: AbortSignal } = {}) {
  return apiGet("/api/sensors", sensorsResponseSchema, { signal });
}

export function getSensorsQueryOptions() {
  return queryOptions({
    queryKey: ["sensors", "list"] as const,
    queryFn: ({ signal }) => getSensors({ signal }),
    // "Last seen" and battery move on their own; the stream does not patch this list.
    refetchInterval: FALLBACK_REFETCH_MS,
  });
}

export function useSensors() {
  return useSuspenseQuery(getSensorsQueryOptions());
}
