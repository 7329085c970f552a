import { useMutation, useQueryClient } from "@tanstack/react-query";
import { siteResponseSchema, type UpdateSiteInput } from "../../../../shared/schemas/layout.js";
import { apiSend } from "../../../lib/api-client";
import { invalidateAfterLayoutChange } from "./invalidate-after-layout-change";

/** PATCH /api/sites/:id (admin): name, time zone. */
export function updateSite({ id, input }: { id: number; input: UpdateSiteInput }) {
  return apiSend("PATCH", `/api/sites/${encodeURIComponent(id)}`, siteResponseSchema, { body: input });
}

export function useUpdateSite() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: updateSite, onSuccess: () => invalidateAfterLayoutChange(queryClient) });
}
