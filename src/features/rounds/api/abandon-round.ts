import { useMutation, useQueryClient } from "@tanstack/react-query";
import { roundResponseSchema } from "../../../../shared/schemas/rounds.js";
import { apiSend } from "../../../lib/api-client";
import { getRoundQueryOptions } from "./get-round";
import { ROUND_LISTS_KEY } from "./get-rounds";

/** POST /api/rounds/:id/abandon (admin, manager, grower): give up a round in progress; nothing is mailed. */
export function abandonRound(roundId: number) {
  return apiSend("POST", `/api/rounds/${encodeURIComponent(roundId)}/abandon`, roundResponseSchema);
}

export function useAbandonRound() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: abandonRound,
    onSuccess: ({ round }) => {
      queryClient.setQueryData(getRoundQueryOptions(round.id).queryKey, { round });
      void queryClient.invalidateQueries({ queryKey: ROUND_LISTS_KEY });
    },
  });
}
