import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { sensorAssignmentsResponseSchema } from "../../../../shared/schemas/layout.js";
import { apiGet } from "../../../lib/api-client";

/** GET /api/benches/:id/assignments (every role): which sensors were on the bench and when, newest first. */
export function getBenchAssignments(benchId: number, { signal }: { signal?: AbortSignal } = {}) {
  return apiGet(`/api/benches/${encodeURIComponent(benchId)}/assignments`, sensorAssignmentsResponseSchema, { signal });
}

export function getBenchAssignmentsQueryOptions(benchId: number) {
  return queryOptions({
    // Under ['layout'], so a layout change (a bench moved, archived) refreshes it too.
    queryKey: ["layout", "assignments", { benchId }] as const,
    queryFn: ({ signal }) => getBenchAssignments(benchId, { signal }),
  });
}

export function useBenchAssignments(benchId: number) {
  return useSuspenseQuery(getBenchAssignmentsQueryOptions(benchId));
}
