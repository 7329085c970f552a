import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { roundsResponseSchema, type RoundsResponse, type RoundStatus } from "../../../../shared/schemas/rounds.js";
import { apiGet } from "../../../lib/api-client";

export const ROUNDS_KEY = ["rounds"] as const;
export const ROUND_LISTS_KEY = ["rounds", "list"] as const;

export type RoundFilters = { status: RoundStatus | "all"; limit?: number };

/** GET /api/rounds (every role): newest first. */
export function getRounds(filters: RoundFilters, { signal }: { signal?: AbortSignal } = {}): Promise<RoundsResponse> {
  return apiGet("/api/rounds", roundsResponseSchema, {
    signal,
    params: { status: filters.status, limit: filters.limit === undefined ? undefined : String(filters.limit) },
  });
}

export function getRoundsQueryOptions(filters: RoundFilters) {
  return queryOptions({
    queryKey: [...ROUND_LISTS_KEY, filters] as const,
    queryFn: ({ signal }) => getRounds(filters, { signal }),
  });
}

export function useRounds(filters: RoundFilters) {
  return useSuspenseQuery(getRoundsQueryOptions(filters));
}
