import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { layoutResponseSchema } from "../../../../shared/schemas/layout.js";
import { apiGet } from "../../../lib/api-client";

/** GET /api/layout (every role): sites, zones and benches in walking order; archived ones on request. */
export function getLayout({ includeArchived }: { includeArchived: boolean }, { signal }: { signal?: AbortSignal } = {}) {
  return apiGet("/api/layout", layoutResponseSchema, { signal, params: { includeArchived: includeArchived ? "true" : undefined } });
}

export function getLayoutQueryOptions({ includeArchived = false }: { includeArchived?: boolean } = {}) {
  return queryOptions({
    queryKey: ["layout", "tree", { includeArchived }] as const,
    queryFn: ({ signal }) => getLayout({ includeArchived }, { signal }),
  });
}

export function useLayout(params: { includeArchived?: boolean } = {}) {
  return useSuspenseQuery(getLayoutQueryOptions(params));
}
