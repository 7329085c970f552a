import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { batchesResponseSchema, type BatchesResponse } from "../../../../shared/schemas/batches.js";
import { apiGet } from "../../../lib/api-client";

/** The list page's filters (GET /api/batches query); left out = not filtered. */
export type BatchFilters = {
  status: "open" | "closed" | "all";
  zoneId?: number;
  benchId?: number;
  variety?: string;
};

/** Every batch query starts with this: invalidate it after anything changes a batch. */
export const BATCHES_KEY = ["batches"] as const;
export const BATCH_LISTS_KEY = ["batches", "list"] as const;

/** GET /api/batches (every role): newest stuck first; `zoneId`/`benchId` look at where batches are now. */
export function getBatches(filters: BatchFilters, { signal }: { signal?: AbortSignal } = {}): Promise<BatchesResponse> {
  return apiGet("/api/batches", batchesResponseSchema, {
    signal,
    params: {
      status: filters.status,
      zoneId: filters.zoneId === undefined ? undefined : String(filters.zoneId),
      benchId: filters.benchId === undefined ? undefined : String(filters.benchId),
      variety: filters.variety?.trim() || undefined,
    },
  });
}

export function getBatchesQueryOptions(filters: BatchFilters) {
  return queryOptions({
    queryKey: [...BATCH_LISTS_KEY, filters] as const,
    queryFn: ({ signal }) => getBatches(filters, { signal }),
  });
}

export function useBatches(filters: BatchFilters) {
  return useSuspenseQuery(getBatchesQueryOptions(filters));
}
