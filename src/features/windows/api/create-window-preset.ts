import { useMutation, useQueryClient } from "@tanstack/react-query";
import { windowPresetResponseSchema, type WindowPresetInput } from "../../../../shared/schemas/windows.js";
import { apiSend } from "../../../lib/api-client";
import { getWindowPresetsQueryOptions } from "./get-window-presets";

export type CreateWindowPresetVariables = { input: WindowPresetInput; dryRun: boolean };

/**
 * POST /api/window-presets (admin, manager). `dryRun` runs every check of a save and answers the
 * guidance warnings without saving; 409 preset-name-taken is on the name field.
 */
export function createWindowPreset({ input, dryRun }: CreateWindowPresetVariables) {
  const query = dryRun ? "?dryRun=true" : "";
  return apiSend("POST", `/api/window-presets${query}`, windowPresetResponseSchema, { body: input });
}

export function useCreateWindowPreset() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createWindowPreset,
    onSuccess: (_saved, { dryRun }) =>
      dryRun
        ? undefined
        : Promise.all([queryClient.invalidateQueries({ queryKey: getWindowPresetsQueryOptions().queryKey }), queryClient.invalidateQueries({ queryKey: ["audit"] })]),
  });
}
