import { useMutation, useQueryClient } from "@tanstack/react-query";
import { layoutResponseSchema } from "../../../../shared/schemas/layout.js";
import { apiSend } from "../../../lib/api-client";
import { invalidateAfterLayoutChange } from "./invalidate-after-layout-change";

/** POST /api/benches/:id/archive (admin, manager). 409 sensors-still-assigned while probes are on it. */
export function archiveBench(id: number) {
  return apiSend("POST", `/api/benches/${encodeURIComponent(id)}/archive`, layoutResponseSchema);
}

export function useArchiveBench() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: archiveBench, onSuccess: () => invalidateAfterLayoutChange(queryClient) });
}
