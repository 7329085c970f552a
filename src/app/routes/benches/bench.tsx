import { useQuery, type QueryClient } from "@tanstack/react-query";
import { data, useNavigate, useParams, useSearchParams, type LoaderFunction, type Params } from "react-router-dom";
import { PanelBoundary } from "../../../components/errors/panel-boundary";
import { RouteError } from "../../../components/errors/route-error";
import { LinkButton } from "../../../components/ui/link-button";
import { paths } from "../../../config/paths";
import { getAlertsQueryOptions } from "../../../features/alerts/api/get-alerts";
import { useBenchObservations } from "../../../features/batches/api/get-bench-observations";
import { ExportCsvButton } from "../../../features/exports/components/export-csv-button";
import { getBenchReadingsQueryOptions, useBenchReadings } from "../../../features/readings/api/get-bench-readings";
import { BenchCharts } from "../../../features/readings/components/bench-charts";
import { RangePicker } from "../../../features/readings/components/range-picker";
import { rangeBounds, rangeFromSearch, rangeToSearch, type ChartRange } from "../../../features/readings/utils/chart-range";
import { getZonesQueryOptions } from "../../../features/zones/api/get-zones";
import { BenchLatest } from "../../../features/zones/components/bench-latest";
import { useNow } from "../../../hooks/use-now";
import { useTemperatureUnit } from "../../../lib/temperature-unit";
import { BenchOpenAlerts } from "../alerts/bench-open-alerts";
import { alertMarkers } from "../history/alert-markers";
import { observationMarkers } from "../history/observation-markers";

function parseBenchId(params: Params): number {
  const benchId = Number(params.benchId);
  if (!Number.isSafeInteger(benchId) || benchId <= 0) {
    throw data("There is no bench with that number.", { status: 404, statusText: "Not found" });
  }
  return benchId;
}

export const clientLoader =
  (queryClient: QueryClient): LoaderFunction =>
  async ({ params, request }) => {
    const benchId = parseBenchId(params);
    const range = rangeFromSearch(new URL(request.url).searchParams);
    await Promise.all([
      queryClient.ensureQueryData(getBenchReadingsQueryOptions({ benchId, range })),
      queryClient.ensureQueryData(getZonesQueryOptions()),
    ]);
    return null;
  };

/**
 * `/benches/:benchId`: the bench's latest values and its history per quantity, the last 24 h by
 * default; `?range=7d|30d` or `?from=YYYY-MM-DD&to=YYYY-MM-DD` for longer, with a CSV export.
 */
export default function BenchRoute() {
  const benchId = parseBenchId(useParams());
  const [search] = useSearchParams();
  const navigate = useNavigate();
  const range = rangeFromSearch(search);
  const { data: readings } = useBenchReadings({ benchId, range });
  const { unit } = useTemperatureUnit();
  const nowMs = useNow();
  const setRange = (next: ChartRange) => void navigate({ search: rangeToSearch(next) }, { replace: true });
  // Alerts raised in the range, marked on the charts; the charts do not wait for them.
  const alerts = useQuery(getAlertsQueryOptions({ status: "all", benchId, fromMs: readings.fromMs, toMs: readings.toMs, limit: 200 }));
  const markers = alertMarkers(alerts.data?.alerts ?? [], { withBench: false });
  // And what growers saw on the bench's batches then.
  const seen = useBenchObservations({ benchId, fromMs: readings.fromMs, toMs: readings.toMs });
  const observations = observationMarkers(seen.data?.observations ?? [], { withBench: false });

  return (
    <>
      <title>{`${readings.bench.name} · ${readings.bench.zoneName} · Benchwarden`}</title>
      <div className="mb-4 flex flex-wrap items-center gap-x-4 gap-y-3">
        <LinkButton to={paths.dashboard.to()}>
          <span aria-hidden="true">←</span> All benches
        </LinkButton>
        <div className="flex-1">
          <h1 className="text-3xl font-bold leading-tight">{readings.bench.name}</h1>
          <p className="text-lg text-muted">{readings.bench.zoneName}</p>
        </div>
        <div className="flex flex-wrap gap-2">
          <LinkButton to={paths.zoneHistory.to(readings.bench.zoneId)}>Zone history</LinkButton>
          <LinkButton to={paths.settingsBench.to(benchId)}>Windows</LinkButton>
        </div>
      </div>
      <div className="flex flex-col gap-8">
        <PanelBoundary>
          <BenchLatest benchId={benchId} unit={unit} nowMs={nowMs} />
        </PanelBoundary>
        <PanelBoundary>
          <BenchOpenAlerts benchId={benchId} nowMs={nowMs} />
        </PanelBoundary>
        <BenchCharts
          readings={readings}
          unit={unit}
          range={range}
          markers={markers}
          observations={observations}
          controls={
            <div className="flex flex-wrap items-start gap-3">
              <RangePicker key={rangeToSearch(range)} range={range} onChange={setRange} />
              <ExportCsvButton
                target={{ benchId }}
                label={`${readings.bench.zoneName} › ${readings.bench.name}`}
                defaultRange={() => rangeBounds(range, Date.now())}
              />
            </div>
          }
        />
      </div>
    </>
  );
}

export const ErrorBoundary = RouteError;
