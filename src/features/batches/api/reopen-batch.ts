import { useMutation, useQueryClient } from "@tanstack/react-query";
import { batchResponseSchema } from "../../../../shared/schemas/batches.js";
import { apiSend } from "../../../lib/api-client";
import { invalidateAfterBatchChange } from "./invalidate-after-batch-change";

/** POST /api/batches/:id/reopen (admin, manager, grower): a closed batch is open again (closed by mistake). */
export function reopenBatch(batchId: number) {
  return apiSend("POST", `/api/batches/${encodeURIComponent(batchId)}/reopen`, batchResponseSchema);
}

export function useReopenBatch() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: reopenBatch,
    onSuccess: ({ batch }) => invalidateAfterBatchChange(queryClient, batch.id, batch),
  });
}
