import { useMutation, useQueryClient } from "@tanstack/react-query";
import { batchResponseSchema, type CreateBatchInput } from "../../../../shared/schemas/batches.js";
import { apiSend } from "../../../lib/api-client";
import { invalidateAfterBatchChange } from "./invalidate-after-batch-change";

/** POST /api/batches (admin, manager, grower): a new batch on a bench in use. */
export function createBatch(input: CreateBatchInput) {
  return apiSend("POST", "/api/batches", batchResponseSchema, { body: input });
}

export function useCreateBatch() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createBatch,
    onSuccess: ({ batch }) => invalidateAfterBatchChange(queryClient, batch.id, batch),
  });
}
