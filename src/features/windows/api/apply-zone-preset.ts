import { useMutation, useQueryClient } from "@tanstack/react-query";
import { zoneWindowsSaveResponseSchema, type ApplyZonePresetInput } from "../../../../shared/schemas/windows.js";
import { apiSend } from "../../../lib/api-client";
import { invalidateAfterWindowChange } from "./invalidate-after-window-change";

export type ApplyZonePresetVariables = { zoneId: number; input: ApplyZonePresetInput; dryRun: boolean };

/** POST /api/zones/:id/windows/preset (admin, manager): the preset's windows and margin replace the zone's. */
export function applyZonePreset({ zoneId, input, dryRun }: ApplyZonePresetVariables) {
  const query = dryRun ? "?dryRun=true" : "";
  return apiSend("POST", `/api/zones/${encodeURIComponent(zoneId)}/windows/preset${query}`, zoneWindowsSaveResponseSchema, { body: input });
}

export function useApplyZonePreset() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: applyZonePreset,
    onSuccess: (saved, { dryRun }) => (dryRun || !saved.changed ? undefined : invalidateAfterWindowChange(queryClient)),
  });
}
