import { useMutation, useQueryClient } from "@tanstack/react-query";
import { checkBenchResponseSchema } from "../../../../shared/schemas/rounds.js";
import { apiSend } from "../../../lib/api-client";
import { applyBenchCheck } from "./get-round-cards";

/** DELETE /api/rounds/:id/benches/:benchId/check (admin, manager, grower): undo a check-off while the round is in progress. */
export function uncheckBench({ roundId, benchId }: { roundId: number; benchId: number }) {
  return apiSend("DELETE", `/api/rounds/${encodeURIComponent(roundId)}/benches/${encodeURIComponent(benchId)}/check`, checkBenchResponseSchema);
}

export function useUncheckBench() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: uncheckBench,
    onSuccess: (answer, { roundId }) => applyBenchCheck(queryClient, roundId, answer),
  });
}
