import { alertKindSchema, alertPhaseSchema } from "../../../../shared/schemas/alerts.js";
import { OPEN_ALERTS_LIMIT, type AlertFilters } from "../api/get-alerts";
import type { AlertsPageFilters } from "../components/alert-filters";

/** How many past alerts one page shows (newest first). */
export const PAST_ALERTS_LIMIT = 200;

/** The alerts page's tab and filters from its address: `?tab=past&zone=2&phase=raised&kind=window`. */
export function alertsPageFiltersFromSearch(search: URLSearchParams): AlertsPageFilters {
  const tab = search.get("tab") === "past" ? "past" : "open";
  const zone = Number(search.get("zone"));
  const phase = alertPhaseSchema.safeParse(search.get("phase"));
  const kind = alertKindSchema.safeParse(search.get("kind"));
  return {
    tab,
    zoneId: Number.isSafeInteger(zone) && zone > 0 ? zone : undefined,
    // Past alerts have all cleared: only the open tab filters by phase.
    phase: tab === "open" && phase.success && phase.data !== "cleared" ? phase.data : undefined,
    kind: kind.success ? kind.data : undefined,
  };
}

/** The API query for a tab and its filters. The open tab without filters is the navigation count's own query. */
export function alertFiltersFor({ tab, zoneId, phase, kind }: AlertsPageFilters): AlertFilters {
  if (tab === "past") return { status: "past", zoneId, kind, limit: PAST_ALERTS_LIMIT };
  return { status: "open", zoneId, kind, phase, limit: OPEN_ALERTS_LIMIT };
}

export function isFiltered(filters: AlertsPageFilters): boolean {
  return filters.zoneId !== undefined || filters.phase !== undefined || filters.kind !== undefined;
}
