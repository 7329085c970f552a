import { useMutation, useQueryClient } from "@tanstack/react-query";
import { roundSummaryResponseSchema } from "../../../../shared/schemas/rounds.js";
import { apiSend } from "../../../lib/api-client";
import { getRoundQueryOptions } from "./get-round";
import { ROUND_LISTS_KEY } from "./get-rounds";
import { getRoundSummaryQueryOptions } from "./get-round-summary";

/**
 * POST /api/rounds/:id/finish (admin, manager, grower): the summary is saved and mailed to the
 * managers. Idempotent: a finished round answers its saved summary and mails nobody again.
 */
export function finishRound(roundId: number) {
  return apiSend("POST", `/api/rounds/${encodeURIComponent(roundId)}/finish`, roundSummaryResponseSchema);
}

export function useFinishRound() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: finishRound,
    onSuccess: (answer) => {
      queryClient.setQueryData(getRoundSummaryQueryOptions(answer.round.id).queryKey, answer);
      queryClient.setQueryData(getRoundQueryOptions(answer.round.id).queryKey, { round: answer.round });
      void queryClient.invalidateQueries({ queryKey: ROUND_LISTS_KEY });
    },
  });
}
