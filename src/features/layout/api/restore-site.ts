import { useMutation, useQueryClient } from "@tanstack/react-query";
import { layoutResponseSchema } from "../../../../shared/schemas/layout.js";
import { apiSend } from "../../../lib/api-client";
import { invalidateAfterLayoutChange } from "./invalidate-after-layout-change";

/** POST /api/sites/:id/restore (admin): brings back what was archived with it. */
export function restoreSite(id: number) {
  return apiSend("POST", `/api/sites/${encodeURIComponent(id)}/restore`, layoutResponseSchema);
}

export function useRestoreSite() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: restoreSite, onSuccess: () => invalidateAfterLayoutChange(queryClient) });
}
