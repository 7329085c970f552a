import { useMutation, useQueryClient } from "@tanstack/react-query";
import { layoutResponseSchema, type BenchOrderInput } from "../../../../shared/schemas/layout.js";
import { apiSend } from "../../../lib/api-client";
import { invalidateAfterLayoutChange } from "./invalidate-after-layout-change";

/** PUT /api/zones/:id/bench-order (admin, manager): every bench of the zone in use, in walking order. */
export function reorderBenches({ zoneId, input }: { zoneId: number; input: BenchOrderInput }) {
  return apiSend("PUT", `/api/zones/${encodeURIComponent(zoneId)}/bench-order`, layoutResponseSchema, { body: input });
}

export function useReorderBenches() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: reorderBenches, onSuccess: () => invalidateAfterLayoutChange(queryClient) });
}
