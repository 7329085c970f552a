import { useMutation, useQueryClient } from "@tanstack/react-query";
import { batchResponseSchema, type CloseBatchInput } from "../../../../shared/schemas/batches.js";
import { apiSend } from "../../../lib/api-client";
import { invalidateAfterBatchChange } from "./invalidate-after-batch-change";

/** POST /api/batches/:id/close (admin, manager, grower): the batch ends with an outcome and final counts. */
export function closeBatch({ batchId, input }: { batchId: number; input: CloseBatchInput }) {
  return apiSend("POST", `/api/batches/${encodeURIComponent(batchId)}/close`, batchResponseSchema, { body: input });
}

export function useCloseBatch() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: closeBatch,
    onSuccess: ({ batch }) => invalidateAfterBatchChange(queryClient, batch.id, batch),
  });
}
