import { useMutation, useQueryClient } from "@tanstack/react-query";
import { zoneResponseSchema, type UpdateZoneInput } from "../../../../shared/schemas/layout.js";
import { apiSend } from "../../../lib/api-client";
import { invalidateAfterLayoutChange } from "./invalidate-after-layout-change";

/** PATCH /api/zones/:id (admin): name, place among the site's zones. */
export function updateZone({ id, input }: { id: number; input: UpdateZoneInput }) {
  return apiSend("PATCH", `/api/zones/${encodeURIComponent(id)}`, zoneResponseSchema, { body: input });
}

export function useUpdateZone() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: updateZone, onSuccess: () => invalidateAfterLayoutChange(queryClient) });
}
