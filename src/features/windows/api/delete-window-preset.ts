import { useMutation, useQueryClient } from "@tanstack/react-query";
import { apiSend } from "../../../lib/api-client";
import { getWindowPresetsQueryOptions } from "./get-window-presets";

/** DELETE /api/window-presets/:id (admin, manager; custom presets). Zones that used it keep their windows. */
export function deleteWindowPreset(id: string) {
  return apiSend("DELETE", `/api/window-presets/${encodeURIComponent(id)}`);
}

export function useDeleteWindowPreset() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: deleteWindowPreset,
    onSuccess: () =>
      Promise.all([queryClient.invalidateQueries({ queryKey: getWindowPresetsQueryOptions().queryKey }), queryClient.invalidateQueries({ queryKey: ["audit"] })]),
  });
}
