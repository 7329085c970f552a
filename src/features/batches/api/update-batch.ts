import { useMutation, useQueryClient } from "@tanstack/react-query";
import { batchResponseSchema, type UpdateBatchInput } from "../../../../shared/schemas/batches.js";
import { apiSend } from "../../../lib/api-client";
import { invalidateAfterBatchChange } from "./invalidate-after-batch-change";

/** PATCH /api/batches/:id (admin, manager, grower): the batch's own fields; the bench changes only by a move. */
export function updateBatch({ batchId, input }: { batchId: number; input: UpdateBatchInput }) {
  return apiSend("PATCH", `/api/batches/${encodeURIComponent(batchId)}`, batchResponseSchema, { body: input });
}

export function useUpdateBatch() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateBatch,
    onSuccess: ({ batch }) => invalidateAfterBatchChange(queryClient, batch.id, batch),
  });
}
