import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { zoneWindowsResponseSchema } from "../../../../shared/schemas/windows.js";
import { apiGet } from "../../../lib/api-client";

/** GET /api/zones/:id/windows (every role): the zone's windows in SI, its dew-point margin, guidance warnings, benches that override. */
export function getZoneWindows(zoneId: number, { signal }: { signal?: AbortSignal } = {}) {
  return apiGet(`/api/zones/${encodeURIComponent(zoneId)}/windows`, zoneWindowsResponseSchema, { signal });
}

export function getZoneWindowsQueryOptions(zoneId: number) {
  return queryOptions({
    queryKey: ["windows", "zone", zoneId] as const,
    queryFn: ({ signal }) => getZoneWindows(zoneId, { signal }),
  });
}

export function useZoneWindows(zoneId: number) {
  return useSuspenseQuery(getZoneWindowsQueryOptions(zoneId));
}
