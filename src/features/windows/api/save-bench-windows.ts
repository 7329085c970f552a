import { useMutation, useQueryClient } from "@tanstack/react-query";
import { benchWindowsSaveResponseSchema, type BenchWindowsInput } from "../../../../shared/schemas/windows.js";
import { apiSend } from "../../../lib/api-client";
import { getBenchWindowsQueryOptions } from "./get-bench-windows";
import { invalidateAfterWindowChange } from "./invalidate-after-window-change";

export type SaveBenchWindowsVariables = { benchId: number; input: BenchWindowsInput; dryRun: boolean };

/**
 * PUT /api/benches/:id/windows (admin, manager): the bench's overrides only; `{ windows: [],
 * dewPointMarginC: null }` makes it follow its zone again. `dryRun` answers warnings, saves nothing.
 */
export function saveBenchWindows({ benchId, input, dryRun }: SaveBenchWindowsVariables) {
  const query = dryRun ? "?dryRun=true" : "";
  return apiSend("PUT", `/api/benches/${encodeURIComponent(benchId)}/windows${query}`, benchWindowsSaveResponseSchema, { body: input });
}

export function useSaveBenchWindows() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: saveBenchWindows,
    onSuccess: (saved, { benchId, dryRun }) => {
      if (dryRun || !saved.changed) return;
      const { dryRun: _dry, changed: _changed, ...view } = saved;
      queryClient.setQueryData(getBenchWindowsQueryOptions(benchId).queryKey, view);
      return invalidateAfterWindowChange(queryClient);
    },
  });
}
