import type { TemperatureUnit } from "../../../../shared/domain/units.js";
import { WINDOWED_QUANTITIES, type WindowedQuantity } from "../../../../shared/schemas/quantities.js";
import type { BenchReadingsResponse } from "../../../../shared/schemas/readings.js";
import { PanelBoundary } from "../../../components/errors/panel-boundary";
import { formatValueParts, formatWindowRange } from "../../../lib/display-value";
import { formatDuration } from "../../../lib/format-time";
import { QUANTITY_LABELS } from "../../../lib/quantity-labels";
import { summarizeSeries } from "../utils/chart-points";
import { ReadingChart } from "./reading-chart";

type BenchChartsProps = { readings: BenchReadingsResponse; unit: TemperatureUnit };

/** The bench page's charts: one per windowed quantity over the response's range (the last 24 h). */
export function BenchCharts({ readings, unit }: BenchChartsProps) {
  return (
    <section aria-labelledby="charts-heading">
      <div className="mb-3 flex flex-wrap items-baseline justify-between gap-2">
        <h2 id="charts-heading" className="text-xl font-bold">
          Last 24 hours
        </h2>
        <ChartKey />
      </div>
      <div className="grid grid-cols-1 gap-4 lg:grid-cols-2">
        {WINDOWED_QUANTITIES.map((quantity) => (
          <PanelBoundary key={quantity}>
            <QuantityChartPanel quantity={quantity} readings={readings} unit={unit} />
          </PanelBoundary>
        ))}
      </div>
    </section>
  );
}

function QuantityChartPanel({
  quantity,
  readings,
  unit,
}: {
  quantity: WindowedQuantity;
  readings: BenchReadingsResponse;
  unit: TemperatureUnit;
}) {
  const points = readings.series.find((s) => s.quantity === quantity)?.points ?? [];
  const window = readings.windows.find((w) => w.quantity === quantity);
  const summary = summarizeSeries(points, readings.bucketMs, window);
  const headingId = `chart-${quantity.replace(".", "-")}`;

  return (
    <figure aria-labelledby={headingId} className="rounded-2xl border-2 border-line bg-surface p-3 sm:p-4">
      <div className="mb-2 flex flex-wrap items-baseline justify-between gap-x-3">
        <h3 id={headingId} className="text-lg font-bold">
          {QUANTITY_LABELS[quantity]}
        </h3>
        {window && <span className="text-base text-muted">Window {formatWindowRange(window, unit)}</span>}
      </div>
      {points.length === 0 ? (
        <p className="flex h-40 items-center justify-center text-lg text-muted">No readings in the last 24 hours</p>
      ) : (
        <ReadingChart
          quantity={quantity}
          points={points}
          window={window}
          unit={unit}
          fromMs={readings.fromMs}
          toMs={readings.toMs}
          bucketMs={readings.bucketMs}
        />
      )}
      {summary && (
        <figcaption className="mt-2 flex flex-wrap gap-x-4 gap-y-1 text-base">
          <span>
            Low <strong>{formatValueParts(quantity, summary.minSi, unit).text}</strong>
          </span>
          <span>
            High <strong>{formatValueParts(quantity, summary.maxSi, unit).text}</strong>
          </span>
          {summary.hasWindow && (
            <span>
              Out of window <strong>{formatDuration(summary.outMs)}</strong>
            </span>
          )}
        </figcaption>
      )}
    </figure>
  );
}

function ChartKey() {
  return (
    <ul className="flex flex-wrap gap-x-4 gap-y-1 text-base text-muted" aria-label="Chart key">
      <li className="flex items-center gap-1.5">
        <span className="inline-block h-1 w-6 rounded bg-[var(--bw-chart-line)]" aria-hidden="true" />
        Mean
      </li>
      <li className="flex items-center gap-1.5">
        <span className="inline-block h-3 w-6 rounded-sm bg-[var(--bw-chart-range)] opacity-50" aria-hidden="true" />
        Low–high
      </li>
      <li className="flex items-center gap-1.5">
        <span
          className="inline-block h-3 w-6 rounded-sm border border-dashed border-[var(--bw-chart-band)] bg-[var(--bw-chart-band)]/25"
          aria-hidden="true"
        />
        Rooting window
      </li>
      <li className="flex items-center gap-1.5">
        <span aria-hidden="true" className="text-low">
          ▼
        </span>
        <span aria-hidden="true" className="text-high">
          ▲
        </span>
        Out of window
      </li>
    </ul>
  );
}
