import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { strikeRateReportSchema, type StrikeRateReport } from "../../../../shared/schemas/batches.js";
import { apiGet } from "../../../lib/api-client";

/** The report's filters (reportQuerySchema); left out = not filtered. Dates bound the date stuck. */
export type ReportFilters = {
  status: "open" | "closed" | "all";
  zoneId?: number;
  variety?: string;
  stuckFrom?: string;
  stuckTo?: string;
};

export const REPORTS_KEY = ["reports"] as const;

/** The filters as query parameters, shared by the report and the CSV links. */
export function reportParams(filters: ReportFilters): Record<string, string | undefined> {
  return {
    status: filters.status,
    zoneId: filters.zoneId === undefined ? undefined : String(filters.zoneId),
    variety: filters.variety?.trim() || undefined,
    stuckFrom: filters.stuckFrom || undefined,
    stuckTo: filters.stuckTo || undefined,
  };
}

/** GET /api/reports/strike-rates (every role): per batch, per variety and per bench, side by side. */
export function getStrikeRates(filters: ReportFilters, { signal }: { signal?: AbortSignal } = {}): Promise<StrikeRateReport> {
  return apiGet("/api/reports/strike-rates", strikeRateReportSchema, { signal, params: reportParams(filters) });
}

export function getStrikeRatesQueryOptions(filters: ReportFilters) {
  return queryOptions({
    queryKey: [...REPORTS_KEY, "strike-rates", filters] as const,
    queryFn: ({ signal }) => getStrikeRates(filters, { signal }),
  });
}

export function useStrikeRates(filters: ReportFilters) {
  return useSuspenseQuery(getStrikeRatesQueryOptions(filters));
}
