import { useMutation, useQueryClient } from "@tanstack/react-query";
import { layoutResponseSchema } from "../../../../shared/schemas/layout.js";
import { apiSend } from "../../../lib/api-client";
import { invalidateAfterLayoutChange } from "./invalidate-after-layout-change";

/** POST /api/sites/:id/archive (admin): the site with its zones and benches. 409 sensors-still-assigned. */
export function archiveSite(id: number) {
  return apiSend("POST", `/api/sites/${encodeURIComponent(id)}/archive`, layoutResponseSchema);
}

export function useArchiveSite() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: archiveSite, onSuccess: () => invalidateAfterLayoutChange(queryClient) });
}
