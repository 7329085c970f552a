import { useMutation, useQueryClient } from "@tanstack/react-query";
import { siteAlertTimingResponseSchema, type SiteAlertTimingInput } from "../../../../shared/schemas/alerts.js";
import { apiSend } from "../../../lib/api-client";
import { getDutyRotaQueryOptions } from "./get-duty-rota";

/**
 * PUT /api/sites/:id/alert-timing (admin, manager): when the managers are told and how often the
 * person on duty is reminded, null for the server's default. 400 with field errors; 404 site-not-found.
 */
export function updateSiteAlertTiming({ siteId, input }: { siteId: number; input: SiteAlertTimingInput }) {
  return apiSend("PUT", `/api/sites/${encodeURIComponent(siteId)}/alert-timing`, siteAlertTimingResponseSchema, { body: input });
}

export function useUpdateSiteAlertTiming() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateSiteAlertTiming,
    // The timing is read with the duty rota.
    onSuccess: () => queryClient.invalidateQueries({ queryKey: getDutyRotaQueryOptions().queryKey }),
  });
}
