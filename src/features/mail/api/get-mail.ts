import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { caughtMailResponseSchema } from "../../../../shared/schemas/mail.js";
import { apiGet } from "../../../lib/api-client";

/** New mail (an invite, an alert) should show up soon after it is sent. */
export const MAIL_REFRESH_MS = 15_000;

/** GET /api/mail (admin): what the local SMTP sink caught, newest first; empty with a real mail relay. */
export function getMail({ signal }: { signal?: AbortSignal } = {}) {
  return apiGet("/api/mail", caughtMailResponseSchema, { signal });
}

export function getMailQueryOptions() {
  return queryOptions({
    queryKey: ["mail", "list"] as const,
    queryFn: ({ signal }) => getMail({ signal }),
    staleTime: 0,
    refetchInterval: MAIL_REFRESH_MS,
  });
}

export function useMail() {
  return useSuspenseQuery(getMailQueryOptions());
}
