import { useMutation, useQueryClient } from "@tanstack/react-query";
import { batchResponseSchema, type MoveBatchInput } from "../../../../shared/schemas/batches.js";
import { apiSend } from "../../../lib/api-client";
import { invalidateAfterBatchChange } from "./invalidate-after-batch-change";

/** POST /api/batches/:id/move (admin, manager, grower): to another bench; the history keeps every placement. */
export function moveBatch({ batchId, input }: { batchId: number; input: MoveBatchInput }) {
  return apiSend("POST", `/api/batches/${encodeURIComponent(batchId)}/move`, batchResponseSchema, { body: input });
}

export function useMoveBatch() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: moveBatch,
    onSuccess: ({ batch }) => invalidateAfterBatchChange(queryClient, batch.id, batch),
  });
}
