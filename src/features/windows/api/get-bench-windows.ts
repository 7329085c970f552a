import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { benchWindowsResponseSchema } from "../../../../shared/schemas/windows.js";
import { apiGet } from "../../../lib/api-client";

/** GET /api/benches/:id/windows (every role): the zone's windows, the bench's overrides, what is in force and where it differs. */
export function getBenchWindows(benchId: number, { signal }: { signal?: AbortSignal } = {}) {
  return apiGet(`/api/benches/${encodeURIComponent(benchId)}/windows`, benchWindowsResponseSchema, { signal });
}

export function getBenchWindowsQueryOptions(benchId: number) {
  return queryOptions({
    queryKey: ["windows", "bench", benchId] as const,
    queryFn: ({ signal }) => getBenchWindows(benchId, { signal }),
  });
}

export function useBenchWindows(benchId: number) {
  return useSuspenseQuery(getBenchWindowsQueryOptions(benchId));
}
