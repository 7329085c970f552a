import { useMutation, useQueryClient } from "@tanstack/react-query";
import { layoutResponseSchema } from "../../../../shared/schemas/layout.js";
import { apiSend } from "../../../lib/api-client";
import { invalidateAfterLayoutChange } from "./invalidate-after-layout-change";

/** POST /api/zones/:id/restore (admin). */
export function restoreZone(id: number) {
  return apiSend("POST", `/api/zones/${encodeURIComponent(id)}/restore`, layoutResponseSchema);
}

export function useRestoreZone() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: restoreZone, onSuccess: () => invalidateAfterLayoutChange(queryClient) });
}
