import { reportParams, type ReportFilters } from "./get-strike-rates";

function withParams(path: string, params: Record<string, string | undefined>): string {
  const search = new URLSearchParams();
  for (const [key, value] of Object.entries(params)) if (value !== undefined) search.set(key, value);
  return search.size > 0 ? `${path}?${search}` : path;
}

/**
 * GET /api/exports/batches.csv and /observations.csv (every role): plain links, so the browser
 * downloads them with the session cookie (Content-Disposition: attachment).
 */
export function batchesCsvUrl(filters: ReportFilters): string {
  return withParams("/api/exports/batches.csv", reportParams(filters));
}

export function observationsCsvUrl(filters: ReportFilters & { batchId?: number }): string {
  return withParams("/api/exports/observations.csv", {
    ...reportParams(filters),
    batchId: filters.batchId === undefined ? undefined : String(filters.batchId),
  });
}
