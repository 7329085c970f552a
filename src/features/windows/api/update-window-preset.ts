import { useMutation, useQueryClient } from "@tanstack/react-query";
import { windowPresetResponseSchema, type UpdateWindowPresetInput } from "../../../../shared/schemas/windows.js";
import { apiSend } from "../../../lib/api-client";
import { getWindowPresetsQueryOptions } from "./get-window-presets";

export type UpdateWindowPresetVariables = { id: string; input: UpdateWindowPresetInput; dryRun: boolean };

/**
 * PATCH /api/window-presets/:id (admin, manager; custom presets only, built-ins answer 409
 * preset-built-in). `dryRun` answers the warnings and whether anything would change, saving nothing.
 */
export function updateWindowPreset({ id, input, dryRun }: UpdateWindowPresetVariables) {
  const query = dryRun ? "?dryRun=true" : "";
  return apiSend("PATCH", `/api/window-presets/${encodeURIComponent(id)}${query}`, windowPresetResponseSchema, { body: input });
}

export function useUpdateWindowPreset() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateWindowPreset,
    onSuccess: (saved, { dryRun }) =>
      dryRun || !saved.changed
        ? undefined
        : Promise.all([queryClient.invalidateQueries({ queryKey: getWindowPresetsQueryOptions().queryKey }), queryClient.invalidateQueries({ queryKey: ["audit"] })]),
  });
}
