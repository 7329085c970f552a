import { infiniteQueryOptions, useSuspenseInfiniteQuery } from "@tanstack/react-query";
import { auditResponseSchema, type AuditEntityType } from "../../../../shared/schemas/audit.js";
import { apiGet } from "../../../lib/api-client";

export type AuditFilters = { zoneId?: number; siteId?: number; benchId?: number; entityType?: AuditEntityType };

export const AUDIT_PAGE_SIZE = 50;

/** GET /api/audit (every role): newest first, paged with `before`; filters combine. */
export function getAudit(filters: AuditFilters, before: number | undefined, { signal }: { signal?: AbortSignal } = {}) {
  const params: Record<string, string | undefined> = {
    zoneId: filters.zoneId?.toString(),
    siteId: filters.siteId?.toString(),
    benchId: filters.benchId?.toString(),
    entityType: filters.entityType,
    before: before?.toString(),
    limit: String(AUDIT_PAGE_SIZE),
  };
  return apiGet("/api/audit", auditResponseSchema, { signal, params });
}

export function getAuditQueryOptions(filters: AuditFilters = {}) {
  return infiniteQueryOptions({
    queryKey: ["audit", "list", filters] as const,
    queryFn: ({ pageParam, signal }) => getAudit(filters, pageParam, { signal }),
    initialPageParam: undefined as number | undefined,
    getNextPageParam: (last) => last.nextBefore ?? undefined,
  });
}

export function useAudit(filters: AuditFilters = {}) {
  return useSuspenseInfiniteQuery(getAuditQueryOptions(filters));
}
