import { useMutation, useQueryClient } from "@tanstack/react-query";
import { ackLinkResponseSchema, type AcknowledgeInput } from "../../../../shared/schemas/alerts.js";
import { apiSend, isApiError } from "../../../lib/api-client";
import { getAckLinkQueryOptions } from "./get-ack-link";

/**
 * POST /api/ack-links/:token (no sign-in): acknowledges every still-raised alert of the link as its
 * recipient and answers the link's alerts as they are now. 410 already-acknowledged
 * ("Already acknowledged by X") or link-not-valid.
 */
export function acknowledgeWithLink({ token, input }: { token: string; input: AcknowledgeInput }) {
  return apiSend("POST", `/api/ack-links/${encodeURIComponent(token)}`, ackLinkResponseSchema, { body: input });
}

export function useAcknowledgeWithLink() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: acknowledgeWithLink,
    onSuccess: (answer, { token }) => queryClient.setQueryData(getAckLinkQueryOptions(token).queryKey, answer),
    onError: (error, { token }) => {
      // Someone else took them meanwhile: read the link again (a GET changes nothing) to show who.
      if (isApiError(error) && error.code === "already-acknowledged") {
        void queryClient.invalidateQueries({ queryKey: getAckLinkQueryOptions(token).queryKey });
      }
    },
  });
}
