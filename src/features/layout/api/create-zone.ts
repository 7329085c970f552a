import { useMutation, useQueryClient } from "@tanstack/react-query";
import { zoneResponseSchema, type CreateZoneInput } from "../../../../shared/schemas/layout.js";
import { apiSend } from "../../../lib/api-client";
import { invalidateAfterLayoutChange } from "./invalidate-after-layout-change";

/** POST /api/zones (admin): a new zone on a site, its windows from a preset (default warm-rooting; null: none). */
export function createZone(input: CreateZoneInput) {
  return apiSend("POST", "/api/zones", zoneResponseSchema, { body: input });
}

export function useCreateZone() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: createZone, onSuccess: () => invalidateAfterLayoutChange(queryClient) });
}
