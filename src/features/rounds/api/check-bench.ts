import { useMutation, useMutationState } from "@tanstack/react-query";
import { checkBenchResponseSchema, type CheckBenchInput } from "../../../../shared/schemas/rounds.js";
import { apiSend } from "../../../lib/api-client";

/**
 * Checking a bench off may wait offline like an observation: the mutationFn below is registered
 * with setMutationDefaults at start (app/offline-work.ts) so a check-off restored after a reload
 * is sent by the same code. The PUT is idempotent (the first check-off's time and person stay).
 */
export const CHECK_BENCH_MUTATION_KEY = ["rounds", "check"] as const;

export type CheckBenchVariables = {
  /** "Check-off · Bench 2": what the waiting list shows. */
  label: string;
  detail?: string;
  roundId: number;
  benchId: number;
  input: CheckBenchInput;
};

/** PUT /api/rounds/:id/benches/:benchId/check (admin, manager, grower); 409 round-not-in-progress once finished. */
export function checkBench({ roundId, benchId, input }: CheckBenchVariables) {
  return apiSend("PUT", `/api/rounds/${encodeURIComponent(roundId)}/benches/${encodeURIComponent(benchId)}/check`, checkBenchResponseSchema, { body: input });
}

export function useCheckBench() {
  return useMutation({ mutationKey: CHECK_BENCH_MUTATION_KEY, mutationFn: checkBench });
}

/** Bench ids of this round checked off here and not yet confirmed by the server. */
export function usePendingChecks(roundId: number): number[] {
  return useMutationState({
    filters: {
      mutationKey: CHECK_BENCH_MUTATION_KEY,
      status: "pending",
      predicate: (m) => (m.state.variables as CheckBenchVariables | undefined)?.roundId === roundId,
    },
    select: (m) => (m.state.variables as CheckBenchVariables).benchId,
  });
}
