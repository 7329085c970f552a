import { useQuery, type QueryClient } from "@tanstack/react-query";
import { data, useNavigate, useParams, useSearchParams, type LoaderFunction, type Params } from "react-router-dom";
import { RouteError } from "../../../components/errors/route-error";
import { LinkButton } from "../../../components/ui/link-button";
import { paths } from "../../../config/paths";
import { getAlertsQueryOptions } from "../../../features/alerts/api/get-alerts";
import { useBenchObservations } from "../../../features/batches/api/get-bench-observations";
import { ExportCsvButton } from "../../../features/exports/components/export-csv-button";
import { getLayoutQueryOptions } from "../../../features/layout/api/get-layout";
import { getZoneReadingsQueryOptions, useZoneReadings } from "../../../features/readings/api/get-zone-readings";
import { RangePicker } from "../../../features/readings/components/range-picker";
import { ZoneCharts } from "../../../features/readings/components/zone-charts";
import { rangeBounds, rangeFromSearch, rangeToSearch, type ChartRange } from "../../../features/readings/utils/chart-range";
import { getZoneWindowsQueryOptions, useZoneWindows } from "../../../features/windows/api/get-zone-windows";
import { useTemperatureUnit } from "../../../lib/temperature-unit";
import { alertMarkers } from "./alert-markers";
import { observationMarkers } from "./observation-markers";

function parseZoneId(params: Params): number {
  const zoneId = Number(params.zoneId);
  if (!Number.isSafeInteger(zoneId) || zoneId <= 0) throw data("There is no zone with that number.", { status: 404, statusText: "Not found" });
  return zoneId;
}

export const clientLoader =
  (queryClient: QueryClient): LoaderFunction =>
  async ({ params, request }) => {
    const zoneId = parseZoneId(params);
    const range = rangeFromSearch(new URL(request.url).searchParams);
    const [layout] = await Promise.all([queryClient.ensureQueryData(getLayoutQueryOptions()), queryClient.ensureQueryData(getZoneWindowsQueryOptions(zoneId))]);
    if (!layout.zones.some((z) => z.id === zoneId)) throw data("There is no zone in use with that number.", { status: 404, statusText: "Not found" });
    await queryClient.ensureQueryData(getZoneReadingsQueryOptions({ zoneId, range }));
    return null;
  };

/** `/zones/:zoneId`: the zone's history, each bench's mean per quantity, with a CSV export of the zone. */
export default function ZoneHistoryRoute() {
  const zoneId = parseZoneId(useParams());
  const [search] = useSearchParams();
  const navigate = useNavigate();
  const range = rangeFromSearch(search);
  const { data: windows } = useZoneWindows(zoneId);
  const { data: readings } = useZoneReadings({ zoneId, range });
  // What growers saw on the zone's charted benches; the charts do not wait for it.
  const seen = useBenchObservations({ zoneId, fromMs: readings.fromMs, toMs: readings.toMs });
  const charted = new Set(readings.benches.map((b) => b.bench.id));
  const observations = observationMarkers((seen.data?.observations ?? []).filter((o) => charted.has(o.benchId)), { withBench: true });
  // And the alerts raised on them, each naming its bench; the charts do not wait for these either.
  const alerts = useQuery(getAlertsQueryOptions({ status: "all", zoneId, fromMs: readings.fromMs, toMs: readings.toMs, limit: 500 }));
  const markers = alertMarkers((alerts.data?.alerts ?? []).filter((a) => charted.has(a.benchId)), { withBench: true });
  const { unit } = useTemperatureUnit();
  const setRange = (next: ChartRange) => void navigate({ search: rangeToSearch(next) }, { replace: true });
  const zone = windows.zone;

  return (
    <>
      <title>{`${zone.name} history · Benchwarden`}</title>
      <div className="mb-4 flex flex-wrap items-center gap-x-4 gap-y-3">
        <LinkButton to={paths.dashboard.to()}>
          <span aria-hidden="true">←</span> All benches
        </LinkButton>
        <div className="flex-1">
          <h1 className="text-3xl font-bold leading-tight">{zone.name}</h1>
          <p className="text-lg text-muted">{zone.siteName} · history of every bench</p>
        </div>
        <LinkButton to={paths.settingsZone.to(zoneId)}>Windows and benches</LinkButton>
      </div>
      <ZoneCharts
        readings={readings}
        zoneWindows={windows.windows}
        unit={unit}
        range={range}
        observations={observations}
        markers={markers}
        controls={
          <div className="flex flex-wrap items-start gap-3">
            <RangePicker key={rangeToSearch(range)} range={range} onChange={setRange} />
            <ExportCsvButton target={{ zoneId }} label={zone.name} defaultRange={() => rangeBounds(range, Date.now())} />
          </div>
        }
      />
    </>
  );
}

export const ErrorBoundary = RouteError;
