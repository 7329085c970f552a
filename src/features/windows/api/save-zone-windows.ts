import { useMutation, useQueryClient } from "@tanstack/react-query";
import { zoneWindowsSaveResponseSchema, type ZoneWindowsInput } from "../../../../shared/schemas/windows.js";
import { apiSend } from "../../../lib/api-client";
import { getZoneWindowsQueryOptions } from "./get-zone-windows";
import { invalidateAfterWindowChange } from "./invalidate-after-window-change";

export type SaveZoneWindowsVariables = { zoneId: number; input: ZoneWindowsInput; dryRun: boolean };

/**
 * PUT /api/zones/:id/windows (admin, manager). `dryRun` validates and answers the guidance
 * warnings without saving; 400 puts each issue on its field (path "windows.0.min").
 */
export function saveZoneWindows({ zoneId, input, dryRun }: SaveZoneWindowsVariables) {
  const query = dryRun ? "?dryRun=true" : "";
  return apiSend("PUT", `/api/zones/${encodeURIComponent(zoneId)}/windows${query}`, zoneWindowsSaveResponseSchema, { body: input });
}

export function useSaveZoneWindows() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: saveZoneWindows,
    onSuccess: (saved, { zoneId, dryRun }) => {
      if (dryRun || !saved.changed) return;
      const { dryRun: _dry, changed: _changed, ...view } = saved;
      queryClient.setQueryData(getZoneWindowsQueryOptions(zoneId).queryKey, view);
      return invalidateAfterWindowChange(queryClient);
    },
  });
}
