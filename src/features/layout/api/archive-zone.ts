import { useMutation, useQueryClient } from "@tanstack/react-query";
import { layoutResponseSchema } from "../../../../shared/schemas/layout.js";
import { apiSend } from "../../../lib/api-client";
import { invalidateAfterLayoutChange } from "./invalidate-after-layout-change";

/** POST /api/zones/:id/archive (admin): the zone with its benches. */
export function archiveZone(id: number) {
  return apiSend("POST", `/api/zones/${encodeURIComponent(id)}/archive`, layoutResponseSchema);
}

export function useArchiveZone() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: archiveZone, onSuccess: () => invalidateAfterLayoutChange(queryClient) });
}
