import { infiniteQueryOptions, useSuspenseInfiniteQuery } from "@tanstack/react-query";
import { auditResponseSchema } from "../../../../shared/schemas/audit.js";
import { apiGet } from "../../../lib/api-client";
import { AUDIT_PAGE_SIZE } from "./get-audit";

/** GET /api/zones/:id/audit (every role): the zone's trail, with what moved out of it, newest first. */
export function getZoneAudit(zoneId: number, before: number | undefined, { signal }: { signal?: AbortSignal } = {}) {
  return apiGet(`/api/zones/${encodeURIComponent(zoneId)}/audit`, auditResponseSchema, {
    signal,
    params: { before: before?.toString(), limit: String(AUDIT_PAGE_SIZE) },
  });
}

export function getZoneAuditQueryOptions(zoneId: number) {
  return infiniteQueryOptions({
    queryKey: ["audit", "zone", { zoneId }] as const,
    queryFn: ({ pageParam, signal }) => getZoneAudit(zoneId, pageParam, { signal }),
    initialPageParam: undefined as number | undefined,
    getNextPageParam: (last) => last.nextBefore ?? undefined,
  });
}

export function useZoneAudit(zoneId: number) {
  return useSuspenseInfiniteQuery(getZoneAuditQueryOptions(zoneId));
}
