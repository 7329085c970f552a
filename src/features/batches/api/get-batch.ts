import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { batchResponseSchema, type BatchResponse } from "../../../../shared/schemas/batches.js";
import { apiGet } from "../../../lib/api-client";

/** GET /api/batches/:id (every role): the batch with its placements, tally and days-to figures. */
export function getBatch(batchId: number, { signal }: { signal?: AbortSignal } = {}): Promise<BatchResponse> {
  return apiGet(`/api/batches/${encodeURIComponent(batchId)}`, batchResponseSchema, { signal });
}

export function getBatchQueryOptions(batchId: number) {
  return queryOptions({
    queryKey: ["batches", "detail", batchId] as const,
    queryFn: ({ signal }) => getBatch(batchId, { signal }),
  });
}

export function useBatch(batchId: number) {
  return useSuspenseQuery(getBatchQueryOptions(batchId));
}
