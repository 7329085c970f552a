import { queryOptions, useSuspenseQuery, type QueryClient } from "@tanstack/react-query";
import type { ObservationView } from "../../../../shared/schemas/batches.js";
import { roundCardsResponseSchema, type CheckBenchResponse, type RoundCardsResponse } from "../../../../shared/schemas/rounds.js";
import { apiGet } from "../../../lib/api-client";
import { getRoundQueryOptions } from "./get-round";

/**
 * GET /api/rounds/:id/cards (every role): one card per bench in walking order — the period's
 * min/max and minutes out of window per quantity, dew point and VPD, alerts, open batches.
 */
export function getRoundCards(roundId: number, { signal }: { signal?: AbortSignal } = {}): Promise<RoundCardsResponse> {
  return apiGet(`/api/rounds/${encodeURIComponent(roundId)}/cards`, roundCardsResponseSchema, { signal });
}

export function getRoundCardsQueryOptions(roundId: number) {
  return queryOptions({
    queryKey: ["rounds", "cards", roundId] as const,
    queryFn: ({ signal }) => getRoundCards(roundId, { signal }),
    // Unchecked cards run to "now": ask again now and then while the round is open.
    refetchInterval: 120_000,
  });
}

export function useRoundCards(roundId: number) {
  return useSuspenseQuery(getRoundCardsQueryOptions(roundId));
}

/** A check-off the server confirmed: put it on the card and the round at once (then ask again in the background). */
export function applyBenchCheck(queryClient: QueryClient, roundId: number, answer: CheckBenchResponse) {
  queryClient.setQueryData(getRoundCardsQueryOptions(roundId).queryKey, (current) =>
    current
      ? {
          round: answer.round,
          cards: current.cards.map((card) => (card.benchId === answer.bench.benchId ? { ...card, check: answer.bench.check } : card)),
        }
      : current,
  );
  queryClient.setQueryData(getRoundQueryOptions(roundId).queryKey, { round: answer.round });
  void queryClient.invalidateQueries({ queryKey: getRoundCardsQueryOptions(roundId).queryKey });
}

/** An observation the server stored during the round: shown under its batch at once. */
export function applyRoundObservation(queryClient: QueryClient, observation: ObservationView) {
  if (observation.roundId === null) return;
  const key = getRoundCardsQueryOptions(observation.roundId).queryKey;
  queryClient.setQueryData(key, (current) =>
    current
      ? {
          ...current,
          cards: current.cards.map((card) => ({
            ...card,
            batches: card.batches.map((batch) =>
              batch.id === observation.batchId
                ? { ...batch, observationsThisRound: [...batch.observationsThisRound.filter((o) => o.id !== observation.id), observation] }
                : batch,
            ),
          })),
        }
      : current,
  );
  void queryClient.invalidateQueries({ queryKey: key });
}
