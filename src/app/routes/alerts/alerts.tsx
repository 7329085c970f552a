import type { QueryClient } from "@tanstack/react-query";
import { useNavigate, useSearchParams, type LoaderFunction } from "react-router-dom";
import { PanelBoundary } from "../../../components/errors/panel-boundary";
import { RouteError } from "../../../components/errors/route-error";
import { paths } from "../../../config/paths";
import { getAlertsQueryOptions } from "../../../features/alerts/api/get-alerts";
import { AlertFilters } from "../../../features/alerts/components/alert-filters";
import { AlertsList } from "../../../features/alerts/components/alerts-list";
import { alertFiltersFor, alertsPageFiltersFromSearch, isFiltered } from "../../../features/alerts/utils/page-filters";
import { getZonesQueryOptions, useZones } from "../../../features/zones/api/get-zones";
import { useNow } from "../../../hooks/use-now";

export const clientLoader =
  (queryClient: QueryClient): LoaderFunction =>
  async ({ request }) => {
    const filters = alertsPageFiltersFromSearch(new URL(request.url).searchParams);
    await Promise.all([
      queryClient.ensureQueryData(getAlertsQueryOptions(alertFiltersFor(filters))),
      queryClient.ensureQueryData(getZonesQueryOptions()),
    ]);
    return null;
  };

/** `/alerts?tab=open|past&zone&phase&kind`: every alert, open ones first, with who took each. */
export default function AlertsRoute() {
  const [searchParams] = useSearchParams();
  const navigate = useNavigate();
  const filters = alertsPageFiltersFromSearch(searchParams);
  const { data: zones } = useZones();
  const nowMs = useNow();

  return (
    <div className="flex flex-col gap-6">
      <title>{filters.tab === "past" ? "Past alerts · Benchwarden" : "Alerts · Benchwarden"}</title>
      <div>
        <h1 className="text-3xl font-bold">Alerts</h1>
        <p className="mt-1 max-w-3xl text-lg text-muted">
          Watching: out of window, hold-off running. Raised: the people on duty were told. Acknowledged: someone has it. Cleared: back in
          window.
        </p>
      </div>
      <AlertFilters
        filters={filters}
        zones={zones.zones.map((z) => ({ id: z.id, name: z.name }))}
        onChange={(next) => void navigate(paths.alerts.to(next), { replace: true })}
      />
      <PanelBoundary>
        <AlertsList filters={alertFiltersFor(filters)} isFiltered={isFiltered(filters)} nowMs={nowMs} />
      </PanelBoundary>
    </div>
  );
}

export const ErrorBoundary = RouteError;
