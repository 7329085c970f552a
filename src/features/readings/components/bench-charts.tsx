import { useState, type ReactNode } from "react";
import { displayUnit, toDisplayValue, type TemperatureUnit } from "../../../../shared/domain/units.js";
import { WINDOWED_QUANTITIES, type WindowedQuantity } from "../../../../shared/schemas/quantities.js";
import type { BenchReadingsResponse } from "../../../../shared/schemas/readings.js";
import { PanelBoundary } from "../../../components/errors/panel-boundary";
import { formatValueParts, formatWindowRange } from "../../../lib/display-value";
import { formatDuration } from "../../../lib/format-time";
import { QUANTITY_LABELS } from "../../../lib/quantity-labels";
import { derivedPoints, niceAxis, outOfWindowStretches, summarizeSeries, toChartPoints, type DerivedPoint } from "../utils/chart-points";
import { DEFAULT_RANGE, describeRange, describeRangeInSentence, type ChartRange } from "../utils/chart-range";
import { DerivedToggles, type DerivedChoice } from "./derived-toggles";
import { MultiLineChart } from "./multi-line-chart";
import { ObservationGlyph, ObservationLane, type ObservationMarker } from "./observation-lane";
import { ReadingChart, type ChartMarker, type ExtraLine } from "./reading-chart";

type BenchChartsProps = {
  readings: BenchReadingsResponse;
  unit: TemperatureUnit;
  range?: ChartRange;
  /** Shown beside the heading: the range picker, the export button. */
  controls?: ReactNode;
  /** Moments to mark, per quantity (alerts raised), composed by the route. */
  markers?: Partial<Record<WindowedQuantity, readonly ChartMarker[]>>;
  /** What growers saw on the bench's batches in the range, marked on every quantity's chart. */
  observations?: readonly ObservationMarker[];
};

/**
 * The bench's charts over the chosen range: one per windowed quantity, and on request the dew
 * point (on the air chart) and the VPD (a chart of its own), both worked out from the air
 * temperature and humidity series with shared/domain/psychrometrics.ts.
 */
export function BenchCharts({ readings, unit, range = DEFAULT_RANGE, controls, markers, observations = [] }: BenchChartsProps) {
  const [derived, setDerived] = useState<DerivedChoice>({ dewPoint: false, vpd: false });
  const series = (q: WindowedQuantity) => readings.series.find((s) => s.quantity === q)?.points ?? [];
  const derivedSeries = derived.dewPoint || derived.vpd ? derivedPoints(series("air.temperature"), series("air.humidity")) : [];

  return (
    <section aria-labelledby="charts-heading">
      <div className="mb-3 flex flex-wrap items-center justify-between gap-3">
        <h2 id="charts-heading" className="text-xl font-bold">
          {describeRange(range)}
        </h2>
        {controls}
      </div>
      <div className="mb-3 flex flex-wrap items-center justify-between gap-3">
        <DerivedToggles value={derived} onChange={setDerived} />
        <ChartKey
          hasDewPoint={derived.dewPoint}
          hasAlerts={Object.values(markers ?? {}).some((list) => list.some((m) => m.timeMs >= readings.fromMs && m.timeMs <= readings.toMs))}
          hasObservations={observations.some((o) => o.timeMs >= readings.fromMs && o.timeMs <= readings.toMs)}
        />
      </div>
      <div className="grid grid-cols-1 gap-4 lg:grid-cols-2">
        {WINDOWED_QUANTITIES.map((quantity) => (
          <PanelBoundary key={quantity}>
            <QuantityChartPanel
              quantity={quantity}
              readings={readings}
              unit={unit}
              range={range}
              extraLine={quantity === "air.temperature" && derived.dewPoint ? dewPointLine(derivedSeries, unit) : undefined}
              markers={markers?.[quantity]}
              observations={observations}
            />
          </PanelBoundary>
        ))}
        {derived.vpd && (
          <PanelBoundary>
            <VpdPanel points={derivedSeries} readings={readings} range={range} />
          </PanelBoundary>
        )}
      </div>
      {(derived.dewPoint || derived.vpd) && (
        <p className="mt-3 text-base text-muted">
          Dew point and VPD are worked out from each interval&apos;s mean air temperature and humidity (dew point by the Magnus form, VPD after FAO-56).
        </p>
      )}
    </section>
  );
}

function dewPointLine(points: readonly DerivedPoint[], unit: TemperatureUnit): ExtraLine {
  const unitLabel = displayUnit("air.temperature", unit);
  return {
    label: "Dew point",
    values: new Map(points.map((p) => [p.timeMs, toDisplayValue("air.temperature", p.dewPointC, unit)])),
    format: (v) => `${v.toFixed(1)} ${unitLabel}`,
  };
}

function QuantityChartPanel({
  quantity,
  readings,
  unit,
  range,
  extraLine,
  markers,
  observations,
}: {
  quantity: WindowedQuantity;
  readings: BenchReadingsResponse;
  unit: TemperatureUnit;
  range: ChartRange;
  extraLine?: ExtraLine;
  markers?: readonly ChartMarker[];
  observations: readonly ObservationMarker[];
}) {
  const points = readings.series.find((s) => s.quantity === quantity)?.points ?? [];
  const window = readings.windows.find((w) => w.quantity === quantity);
  const summary = summarizeSeries(points, readings.bucketMs, window, Math.min(readings.toMs, Date.now()));
  // From bucket means: exact to the minute on short ranges, an estimate on long ones.
  const isEstimate = readings.bucketMs > 5 * 60_000;
  const stretchCount = window ? outOfWindowStretches(toChartPoints(points, quantity, unit, readings.bucketMs, window), readings.bucketMs).length : 0;
  const headingId = `chart-${quantity.replace(".", "-")}`;

  return (
    <figure aria-labelledby={headingId} data-quantity={quantity} className="rounded-2xl border-2 border-line bg-surface p-3 sm:p-4">
      <div className="mb-2 flex flex-wrap items-baseline justify-between gap-x-3">
        <h3 id={headingId} className="text-lg font-bold">
          {QUANTITY_LABELS[quantity]}
        </h3>
        {window && <span className="text-base text-muted">Window {formatWindowRange(window, unit)}</span>}
      </div>
      {points.length === 0 ? (
        <p className="flex h-40 items-center justify-center text-lg text-muted">No readings {describeRangeInSentence(range)}</p>
      ) : (
        <>
          <ReadingChart
            quantity={quantity}
            points={points}
            window={window}
            unit={unit}
            fromMs={readings.fromMs}
            toMs={readings.toMs}
            bucketMs={readings.bucketMs}
            extraLine={extraLine}
            markers={markers}
            observations={observations}
          />
          <ObservationLane markers={observations} fromMs={readings.fromMs} toMs={readings.toMs} />
        </>
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
              Out of window <strong>{isEstimate && summary.outMs > 0 ? "≈ " : ""}{formatDuration(summary.outMs)}</strong>
              {stretchCount > 0 && ` in ${stretchCount === 1 ? "1 stretch" : `${stretchCount} stretches`}`}
            </span>
          )}
        </figcaption>
      )}
    </figure>
  );
}

function VpdPanel({ points, readings, range }: { points: readonly DerivedPoint[]; readings: BenchReadingsResponse; range: ChartRange }) {
  let lo = Infinity;
  let hi = -Infinity;
  for (const p of points) {
    lo = Math.min(lo, p.vpdKPa);
    hi = Math.max(hi, p.vpdKPa);
  }
  return (
    <figure aria-labelledby="chart-vpd" data-quantity="vpd" className="rounded-2xl border-2 border-line bg-surface p-3 sm:p-4">
      <div className="mb-2 flex flex-wrap items-baseline justify-between gap-x-3">
        <h3 id="chart-vpd" className="text-lg font-bold">
          Vapour-pressure deficit (VPD)
        </h3>
        <span className="text-base text-muted">kPa</span>
      </div>
      {points.length === 0 ? (
        <p className="flex h-40 items-center justify-center text-lg text-muted">No air temperature and humidity {describeRangeInSentence(range)}</p>
      ) : (
        <MultiLineChart
          series={[{ key: "vpd", label: "VPD", color: "var(--bw-accent)", points: points.map((p) => ({ timeMs: p.timeMs, value: p.vpdKPa, status: "unknown" })) }]}
          fromMs={readings.fromMs}
          toMs={readings.toMs}
          bucketMs={readings.bucketMs}
          axis={niceAxis(lo, hi, 0.4)}
          formatValue={(v) => `${v.toFixed(2)} kPa`}
          heightPx={220}
        />
      )}
      {points.length > 0 && (
        <figcaption className="mt-2 flex flex-wrap gap-x-4 gap-y-1 text-base">
          <span>
            Low <strong>{lo.toFixed(2)} kPa</strong>
          </span>
          <span>
            High <strong>{hi.toFixed(2)} kPa</strong>
          </span>
        </figcaption>
      )}
    </figure>
  );
}

export function ChartKey({ hasDewPoint = false, hasAlerts = false, hasObservations = false }: { hasDewPoint?: boolean; hasAlerts?: boolean; hasObservations?: boolean }) {
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
        <span aria-hidden="true" className="inline-block h-3 w-6 rounded-sm bg-[var(--bw-high)] opacity-25" />
        <span aria-hidden="true" className="text-low">
          ▼
        </span>
        <span aria-hidden="true" className="text-high">
          ▲
        </span>
        Out of window
      </li>
      {hasDewPoint && (
        <li className="flex items-center gap-1.5">
          <span className="inline-block w-6 border-t-2 border-dashed border-[var(--bw-accent)]" aria-hidden="true" />
          Dew point
        </li>
      )}
      {hasAlerts && <AlertKeyItem />}
      {hasObservations && <ObservationKeyItem />}
    </ul>
  );
}

/** The key's entry for alert marks: a dashed upright line labelled ⚠. */
export function AlertKeyItem() {
  return (
    <li className="flex items-center gap-1.5">
      <span className="inline-block h-4 border-l-2 border-dotted border-[var(--bw-ink)]" aria-hidden="true" />
      <span aria-hidden="true">⚠</span>
      Alert raised
    </li>
  );
}

/** The key's entry for observation marks: ◇ under the chart on a thin solid line, ◆ when something was flagged. */
export function ObservationKeyItem() {
  return (
    <li className="flex items-center gap-1.5">
      <ObservationGlyph isFlagged={false} />
      <ObservationGlyph isFlagged />
      Observation (filled: something flagged)
    </li>
  );
}
