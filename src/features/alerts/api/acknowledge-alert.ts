import { useMutation, useQueryClient } from "@tanstack/react-query";
import { z } from "zod";
import { alertSchema, type AcknowledgeInput } from "../../../../shared/schemas/alerts.js";
import { apiSend } from "../../../lib/api-client";
import { updateAlertQueries } from "../utils/update-alert-queries";
import { getAlertQueryOptions } from "./get-alert";
import { ALERT_LISTS_KEY } from "./get-alerts";

const acknowledgeResponseSchema = z.object({ alert: alertSchema });

/**
 * The mutation's key: the signed-in layout listens for it and puts the acknowledged alert on the
 * bench cards too (app/live-updates.ts), without waiting for the stream.
 */
export const ACKNOWLEDGE_ALERT_MUTATION_KEY = ["alerts", "acknowledge"] as const;

/**
 * POST /api/alerts/:id/acknowledge (admin, manager, grower): "I've got it", with an optional note.
 * 409 alert-not-acknowledgeable with a plain detail ("Already acknowledged by …").
 */
export function acknowledgeAlert({ alertId, input }: { alertId: number; input: AcknowledgeInput }) {
  return apiSend("POST", `/api/alerts/${encodeURIComponent(alertId)}/acknowledge`, acknowledgeResponseSchema, { body: input });
}

export function useAcknowledgeAlert() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationKey: ACKNOWLEDGE_ALERT_MUTATION_KEY,
    mutationFn: acknowledgeAlert,
    onSuccess: ({ alert }) => updateAlertQueries(queryClient, [alert]),
    onError: (_error, { alertId }) => {
      // Someone else got there first, or it cleared meanwhile (409): show what the alert is now.
      void queryClient.invalidateQueries({ queryKey: getAlertQueryOptions(alertId).queryKey });
      void queryClient.invalidateQueries({ queryKey: ALERT_LISTS_KEY });
    },
  });
}
