import { useMutation, useQueryClient } from "@tanstack/react-query";
import { startRoundResponseSchema, type StartRoundInput } from "../../../../shared/schemas/rounds.js";
import { apiSend } from "../../../lib/api-client";
import { getRoundQueryOptions } from "./get-round";
import { ROUND_LISTS_KEY } from "./get-rounds";

/**
 * POST /api/rounds (admin, manager, grower): a zone (`zoneId`) or every zone of the site. 201 for
 * a new round, 200 `resumed: true` when that scope already has one in progress; 409
 * round-overlaps (naming who walks it) when a zone round and a whole-site round would overlap.
 */
export function startRound(input: StartRoundInput) {
  return apiSend("POST", "/api/rounds", startRoundResponseSchema, { body: input });
}

export function useStartRound() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: startRound,
    onSuccess: ({ round }) => {
      queryClient.setQueryData(getRoundQueryOptions(round.id).queryKey, { round });
      void queryClient.invalidateQueries({ queryKey: ROUND_LISTS_KEY });
    },
  });
}
