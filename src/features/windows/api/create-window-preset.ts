import { useMutation, useQueryClient } from "@tanstack/react-query";
import { windowPresetResponseSchema, type WindowPresetInput } from "../../../../shared/schemas/windows.js";
import { apiSend } from "../../../lib/api-client";
import { getWindowPresetsQueryOptions } from "./get-window-presets";

/** POST /api/window-presets (admin, manager). 409 preset-name-taken is on the name field. */
export function createWindowPreset(input: WindowPresetInput) {
  return apiSend("POST", "/api/window-presets", windowPresetResponseSchema, { body: input });
}

export function useCreateWindowPreset() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createWindowPreset,
    onSuccess: () =>
      Promise.all([queryClient.invalidateQueries({ queryKey: getWindowPresetsQueryOptions().queryKey }), queryClient.invalidateQueries({ queryKey: ["audit"] })]),
  });
}
