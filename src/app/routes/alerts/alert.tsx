import type { QueryClient } from "@tanstack/react-query";
import { data, useParams, type LoaderFunction, type Params } from "react-router-dom";
import { celsiusToFahrenheit, type TemperatureUnit } from "../../../../shared/domain/units.js";
import type { AlertView } from "../../../../shared/schemas/alerts.js";
import type { WindowedQuantity } from "../../../../shared/schemas/quantities.js";
import type { BenchReadingsResponse } from "../../../../shared/schemas/readings.js";
import { PanelBoundary } from "../../../components/errors/panel-boundary";
import { RouteError } from "../../../components/errors/route-error";
import { LinkButton } from "../../../components/ui/link-button";
import { PhasePill } from "../../../components/ui/phase-pill";
import { paths } from "../../../config/paths";
import { getAlertQueryOptions, useAlert } from "../../../features/alerts/api/get-alert";
import { AcknowledgeButton } from "../../../features/alerts/components/acknowledge-button";
import { AlertDetails } from "../../../features/alerts/components/alert-details";
import { ExcursionStrip } from "../../../features/alerts/components/excursion-strip";
import { excursionQuantities, excursionRange } from "../../../features/alerts/utils/excursion-range";
import { getBenchReadingsBetweenQueryOptions, useBenchReadingsBetween } from "../../../features/readings/api/get-bench-readings-between";
import { ReadingChart, type ExtraLine } from "../../../features/readings/components/reading-chart";
import { derivedPoints } from "../../../features/readings/utils/chart-points";
import { useNow } from "../../../hooks/use-now";
import { alertTitle } from "../../../lib/alert-words";
import { formatWindowRange } from "../../../lib/display-value";
import { QUANTITY_LABELS } from "../../../lib/quantity-labels";
import { useTemperatureUnit } from "../../../lib/temperature-unit";

function parseAlertId(params: Params): number {
  const alertId = Number(params.alertId);
  if (!Number.isSafeInteger(alertId) || alertId <= 0) {
    throw data("There is no alert with that number.", { status: 404, statusText: "Not found" });
  }
  return alertId;
}

export const clientLoader =
  (queryClient: QueryClient): LoaderFunction =>
  async ({ params }) => {
    const { alert } = await queryClient.ensureQueryData(getAlertQueryOptions(parseAlertId(params)));
    // prefetch, not ensure: a chart that fails to load is the chart panel's problem, not the page's.
    await queryClient.prefetchQuery(getBenchReadingsBetweenQueryOptions({ benchId: alert.benchId, ...excursionRange(alert, Date.now()) }));
    return null;
  };

/** `/alerts/:alertId`: every field of one alert and its bench's readings around the excursion. */
export default function AlertRoute() {
  const alertId = parseAlertId(useParams());
  const { data: answer } = useAlert(alertId);
  const { alert } = answer;
  const { unit } = useTemperatureUnit();
  const nowMs = useNow();
  const title = alertTitle(alert);

  return (
    <div className="flex flex-col gap-6">
      <title>{`${title} · ${alert.benchName} · Benchwarden`}</title>
      <div className="flex flex-wrap items-center gap-x-4 gap-y-3">
        <LinkButton to={paths.alerts.to({ tab: alert.phase === "cleared" ? "past" : "open" })}>
          <span aria-hidden="true">←</span> All alerts
        </LinkButton>
        <div className="min-w-0">
          <h1 className="text-3xl font-bold leading-tight">{title}</h1>
          <p className="text-lg text-muted">
            {alert.benchName} · {alert.zoneName}
          </p>
        </div>
        <PhasePill phase={alert.phase} className="text-lg" />
      </div>
      <AcknowledgeButton alert={alert} className="min-h-16 w-full text-xl sm:w-auto sm:self-start" />
      <div className="grid gap-8 lg:grid-cols-[minmax(0,2fr)_minmax(0,3fr)]">
        <section aria-labelledby="details-heading">
          <h2 id="details-heading" className="mb-2 text-xl font-bold">
            Details
          </h2>
          <AlertDetails alert={alert} unit={unit} nowMs={nowMs} />
        </section>
        <PanelBoundary>
          <ExcursionCharts alert={alert} unit={unit} nowMs={nowMs} />
        </PanelBoundary>
      </div>
    </div>
  );
}

function ExcursionCharts({ alert, unit, nowMs }: { alert: AlertView; unit: TemperatureUnit; nowMs: number }) {
  const range = excursionRange(alert, nowMs);
  const { data: readings } = useBenchReadingsBetween({ benchId: alert.benchId, ...range });
  const series = (q: WindowedQuantity) => readings.series.find((s) => s.quantity === q)?.points ?? [];
  const quantities = excursionQuantities(alert);
  // A silent sensor: chart what the bench has, not four empty boxes.
  const shown = alert.kind === "sensor-silent" ? quantities.filter((q) => series(q).length > 0) : quantities;

  return (
    <section aria-labelledby="excursion-heading" className="flex flex-col gap-4">
      <h2 id="excursion-heading" className="text-xl font-bold">
        Around the excursion
      </h2>
      {shown.length === 0 && <p className="text-lg text-muted">No readings from this bench around that time.</p>}
      {shown.map((quantity) => (
        <ExcursionChart
          key={quantity}
          alert={alert}
          quantity={quantity}
          readings={readings}
          unit={unit}
          extraLine={alert.kind === "condensation" && quantity === "air.temperature" ? dewPointLine(readings, unit) : undefined}
        />
      ))}
    </section>
  );
}

/** The dew point as a dashed line on the air-temperature chart: condensation is the two lines meeting. */
function dewPointLine(readings: BenchReadingsResponse, unit: TemperatureUnit): ExtraLine {
  const series = (q: WindowedQuantity) => readings.series.find((s) => s.quantity === q)?.points ?? [];
  const toUnit = (c: number) => (unit === "F" ? celsiusToFahrenheit(c) : c);
  const values = new Map(derivedPoints(series("air.temperature"), series("air.humidity")).map((p) => [p.timeMs, toUnit(p.dewPointC)]));
  return { label: "Dew point", values, format: (v) => `${v.toFixed(1)} ${unit === "F" ? "°F" : "°C"}` };
}

type ExcursionChartProps = {
  alert: AlertView;
  quantity: WindowedQuantity;
  readings: BenchReadingsResponse;
  unit: TemperatureUnit;
  extraLine?: ExtraLine;
};

function ExcursionChart({ alert, quantity, readings, unit, extraLine }: ExcursionChartProps) {
  const points = readings.series.find((s) => s.quantity === quantity)?.points ?? [];
  const window = readings.windows.find((w) => w.quantity === quantity);
  const headingId = `excursion-${quantity.replace(".", "-")}`;
  return (
    <figure aria-labelledby={headingId} className="rounded-2xl border-2 border-line bg-surface p-3 sm:p-4">
      <div className="mb-2 flex flex-wrap items-baseline justify-between gap-x-3">
        <h3 id={headingId} className="text-lg font-bold">
          {QUANTITY_LABELS[quantity]}
        </h3>
        {window && <span className="text-base text-muted">Window {formatWindowRange(window, unit)}</span>}
      </div>
      {points.length === 0 ? (
        <p className="flex h-40 items-center justify-center text-lg text-muted">No readings in this time</p>
      ) : (
        <ReadingChart
          quantity={quantity}
          points={points}
          window={window}
          unit={unit}
          fromMs={readings.fromMs}
          toMs={readings.toMs}
          bucketMs={readings.bucketMs}
          extraLine={extraLine}
        />
      )}
      <ExcursionStrip fromMs={readings.fromMs} toMs={readings.toMs} startMs={alert.sinceMs} endMs={alert.clearedAtMs} />
      {extraLine && <figcaption className="mt-1 text-base text-muted">Dashed: the dew point, from air temperature and humidity.</figcaption>}
    </figure>
  );
}

export const ErrorBoundary = RouteError;
