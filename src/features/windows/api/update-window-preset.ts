import { useMutation, useQueryClient } from "@tanstack/react-query";
import { windowPresetResponseSchema, type UpdateWindowPresetInput } from "../../../../shared/schemas/windows.js";
import { apiSend } from "../../../lib/api-client";
import { getWindowPresetsQueryOptions } from "./get-window-presets";

/** PATCH /api/window-presets/:id (admin, manager; custom presets only, built-ins answer 409 preset-built-in). */
export function updateWindowPreset({ id, input }: { id: string; input: UpdateWindowPresetInput }) {
  return apiSend("PATCH", `/api/window-presets/${encodeURIComponent(id)}`, windowPresetResponseSchema, { body: input });
}

export function useUpdateWindowPreset() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateWindowPreset,
    onSuccess: () =>
      Promise.all([queryClient.invalidateQueries({ queryKey: getWindowPresetsQueryOptions().queryKey }), queryClient.invalidateQueries({ queryKey: ["audit"] })]),
  });
}
