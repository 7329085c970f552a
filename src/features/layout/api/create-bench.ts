import { useMutation, useQueryClient } from "@tanstack/react-query";
import { benchResponseSchema, type CreateBenchInput } from "../../../../shared/schemas/layout.js";
import { apiSend } from "../../../lib/api-client";
import { invalidateAfterLayoutChange } from "./invalidate-after-layout-change";

/** POST /api/benches (admin, manager): a bench at the end of the zone's walking order. */
export function createBench(input: CreateBenchInput) {
  return apiSend("POST", "/api/benches", benchResponseSchema, { body: input });
}

export function useCreateBench() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: createBench, onSuccess: () => invalidateAfterLayoutChange(queryClient) });
}
