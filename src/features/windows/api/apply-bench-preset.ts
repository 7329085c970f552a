import { useMutation, useQueryClient } from "@tanstack/react-query";
import { benchWindowsSaveResponseSchema, type ApplyBenchPresetInput } from "../../../../shared/schemas/windows.js";
import { apiSend } from "../../../lib/api-client";
import { invalidateAfterWindowChange } from "./invalidate-after-window-change";

export type ApplyBenchPresetVariables = { benchId: number; input: ApplyBenchPresetInput; dryRun: boolean };

/** POST /api/benches/:id/windows/preset (admin, manager): the preset's windows and margin become the bench's overrides. */
export function applyBenchPreset({ benchId, input, dryRun }: ApplyBenchPresetVariables) {
  const query = dryRun ? "?dryRun=true" : "";
  return apiSend("POST", `/api/benches/${encodeURIComponent(benchId)}/windows/preset${query}`, benchWindowsSaveResponseSchema, { body: input });
}

export function useApplyBenchPreset() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: applyBenchPreset,
    onSuccess: (saved, { dryRun }) => (dryRun || !saved.changed ? undefined : invalidateAfterWindowChange(queryClient)),
  });
}
