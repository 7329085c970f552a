import { useMutation, useQueryClient } from "@tanstack/react-query";
import { benchResponseSchema, type UpdateBenchInput } from "../../../../shared/schemas/layout.js";
import { apiSend } from "../../../lib/api-client";
import { invalidateAfterLayoutChange } from "./invalidate-after-layout-change";

/** PATCH /api/benches/:id (admin, manager): rename, or move to another zone (readings and overrides go with it). */
export function updateBench({ id, input }: { id: number; input: UpdateBenchInput }) {
  return apiSend("PATCH", `/api/benches/${encodeURIComponent(id)}`, benchResponseSchema, { body: input });
}

export function useUpdateBench() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: updateBench, onSuccess: () => invalidateAfterLayoutChange(queryClient) });
}
