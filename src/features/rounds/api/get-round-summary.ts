import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { roundSummaryResponseSchema, type RoundSummaryResponse } from "../../../../shared/schemas/rounds.js";
import { apiGet } from "../../../lib/api-client";

/** GET /api/rounds/:id/summary (every role): what a finished round found, as it was saved and mailed. */
export function getRoundSummary(roundId: number, { signal }: { signal?: AbortSignal } = {}): Promise<RoundSummaryResponse> {
  return apiGet(`/api/rounds/${encodeURIComponent(roundId)}/summary`, roundSummaryResponseSchema, { signal });
}

export function getRoundSummaryQueryOptions(roundId: number) {
  return queryOptions({
    queryKey: ["rounds", "summary", roundId] as const,
    queryFn: ({ signal }) => getRoundSummary(roundId, { signal }),
    // A saved summary does not change.
    staleTime: Infinity,
  });
}

export function useRoundSummary(roundId: number) {
  return useSuspenseQuery(getRoundSummaryQueryOptions(roundId));
}
