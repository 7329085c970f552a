import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { observationsResponseSchema, type ObservationsResponse } from "../../../../shared/schemas/batches.js";
import { apiGet } from "../../../lib/api-client";

/** GET /api/batches/:id/observations (every role): oldest first, each with its photos. */
export function getObservations(batchId: number, { signal }: { signal?: AbortSignal } = {}): Promise<ObservationsResponse> {
  return apiGet(`/api/batches/${encodeURIComponent(batchId)}/observations`, observationsResponseSchema, { signal });
}

export function getObservationsQueryOptions(batchId: number) {
  return queryOptions({
    queryKey: ["batches", "observations", batchId] as const,
    queryFn: ({ signal }) => getObservations(batchId, { signal }),
  });
}

export function useObservations(batchId: number) {
  return useSuspenseQuery(getObservationsQueryOptions(batchId));
}
