import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { roundResponseSchema, type RoundResponse } from "../../../../shared/schemas/rounds.js";
import { apiGet } from "../../../lib/api-client";

/** GET /api/rounds/:id (every role): the round, its benches in walking order and their check-offs. */
export function getRound(roundId: number, { signal }: { signal?: AbortSignal } = {}): Promise<RoundResponse> {
  return apiGet(`/api/rounds/${encodeURIComponent(roundId)}`, roundResponseSchema, { signal });
}

export function getRoundQueryOptions(roundId: number) {
  return queryOptions({
    queryKey: ["rounds", "detail", roundId] as const,
    queryFn: ({ signal }) => getRound(roundId, { signal }),
  });
}

export function useRound(roundId: number) {
  return useSuspenseQuery(getRoundQueryOptions(roundId));
}
