import type { QueryClient } from "@tanstack/react-query";
import { data, useParams, type LoaderFunction, type Params } from "react-router-dom";
import { PanelBoundary } from "../../../components/errors/panel-boundary";
import { RouteError } from "../../../components/errors/route-error";
import { LinkButton } from "../../../components/ui/link-button";
import { paths } from "../../../config/paths";
import { getBenchReadingsQueryOptions, useBenchReadings } from "../../../features/readings/api/get-bench-readings";
import { BenchCharts } from "../../../features/readings/components/bench-charts";
import { getZonesQueryOptions } from "../../../features/zones/api/get-zones";
import { BenchLatest } from "../../../features/zones/components/bench-latest";
import { useNow } from "../../../hooks/use-now";
import { useTemperatureUnit } from "../../../lib/temperature-unit";

function parseBenchId(params: Params): number {
  const benchId = Number(params.benchId);
  if (!Number.isSafeInteger(benchId) || benchId <= 0) {
    throw data("There is no bench with that number.", { status: 404, statusText: "Not found" });
  }
  return benchId;
}

export const clientLoader =
  (queryClient: QueryClient): LoaderFunction =>
  async ({ params }) => {
    const benchId = parseBenchId(params);
    await Promise.all([
      queryClient.ensureQueryData(getBenchReadingsQueryOptions({ benchId })),
      queryClient.ensureQueryData(getZonesQueryOptions()),
    ]);
    return null;
  };

/** `/benches/:benchId`: the bench's latest values and its last 24 h per quantity. */
export default function BenchRoute() {
  const benchId = parseBenchId(useParams());
  const { data: readings } = useBenchReadings({ benchId });
  const { unit } = useTemperatureUnit();
  const nowMs = useNow();

  return (
    <>
      <title>{`${readings.bench.name} · ${readings.bench.zoneName} · Benchwarden`}</title>
      <div className="mb-4 flex flex-wrap items-center gap-x-4 gap-y-3">
        <LinkButton to={paths.dashboard.to()}>
          <span aria-hidden="true">←</span> All benches
        </LinkButton>
        <div>
          <h1 className="text-3xl font-bold leading-tight">{readings.bench.name}</h1>
          <p className="text-lg text-muted">{readings.bench.zoneName}</p>
        </div>
      </div>
      <div className="flex flex-col gap-8">
        <PanelBoundary>
          <BenchLatest benchId={benchId} unit={unit} nowMs={nowMs} />
        </PanelBoundary>
        <BenchCharts readings={readings} unit={unit} />
      </div>
    </>
  );
}

export const ErrorBoundary = RouteError;
