import { useMutation, useQueryClient } from "@tanstack/react-query";
import { layoutResponseSchema } from "../../../../shared/schemas/layout.js";
import { apiSend } from "../../../lib/api-client";
import { invalidateAfterLayoutChange } from "./invalidate-after-layout-change";

/** POST /api/benches/:id/restore (admin, manager). */
export function restoreBench(id: number) {
  return apiSend("POST", `/api/benches/${encodeURIComponent(id)}/restore`, layoutResponseSchema);
}

export function useRestoreBench() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: restoreBench, onSuccess: () => invalidateAfterLayoutChange(queryClient) });
}
