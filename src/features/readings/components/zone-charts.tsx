import { useState, type ReactNode } from "react";
import { displayDecimals, displayUnit, toDisplayValue, type TemperatureUnit } from "../../../../shared/domain/units.js";
import { WINDOWED_QUANTITIES, type WindowedQuantity } from "../../../../shared/schemas/quantities.js";
import type { BenchReadingsResponse } from "../../../../shared/schemas/readings.js";
import type { QuantityWindow } from "../../../../shared/schemas/windows.js";
import { PanelBoundary } from "../../../components/errors/panel-boundary";
import { formatWindowRange } from "../../../lib/display-value";
import { formatDuration } from "../../../lib/format-time";
import { QUANTITY_LABELS } from "../../../lib/quantity-labels";
import type { ZoneReadings } from "../api/get-zone-readings";
import { derivedPoints, niceAxis, outOfWindowStretches, summarizeSeries, toChartPoints, type OutOfWindowStretch } from "../utils/chart-points";
import { DEFAULT_RANGE, describeRange, describeRangeInSentence, type ChartRange } from "../utils/chart-range";
import { DerivedToggles, type DerivedChoice } from "./derived-toggles";
import { AlertKeyItem, ObservationKeyItem } from "./bench-charts";
import { MultiLineChart, lineStyle, type LineSeries } from "./multi-line-chart";
import { ObservationLane, type ObservationMarker } from "./observation-lane";
import type { ChartMarker } from "./reading-chart";

type ZoneChartsProps = {
  readings: ZoneReadings;
  /** The zone's own windows, drawn as the band (a bench that overrides is judged by its own). */
  zoneWindows: readonly QuantityWindow[];
  unit: TemperatureUnit;
  range?: ChartRange;
  controls?: ReactNode;
  /** What growers saw on the zone's benches in the range (each marker names its bench), marked on every quantity's chart. */
  observations?: readonly ObservationMarker[];
  /** Alerts raised on the zone's benches in the range, per quantity (each label names its bench), composed by the route. */
  markers?: Partial<Record<WindowedQuantity, readonly ChartMarker[]>>;
};

const seriesOf = (bench: BenchReadingsResponse, q: WindowedQuantity) => bench.series.find((s) => s.quantity === q)?.points ?? [];

/**
 * A zone's history: per quantity one chart with each bench's mean as its own line (colour and
 * dash), the zone's window as the band, and the stretches each bench spent out of its own window
 * shaded and marked. Dew point and VPD per bench on request.
 */
export function ZoneCharts({ readings, zoneWindows, unit, range = DEFAULT_RANGE, controls, observations = [], markers }: ZoneChartsProps) {
  const [derived, setDerived] = useState<DerivedChoice>({ dewPoint: false, vpd: false });
  const styles = new Map(readings.benches.map((b, i) => [b.bench.id, lineStyle(i)]));

  return (
    <section aria-labelledby="zone-charts-heading">
      <div className="mb-3 flex flex-wrap items-center justify-between gap-3">
        <h2 id="zone-charts-heading" className="text-xl font-bold">
          {describeRange(range)}
        </h2>
        {controls}
      </div>
      <div className="mb-3 flex flex-wrap items-center justify-between gap-3">
        <DerivedToggles value={derived} onChange={setDerived} />
        <BenchKey
          readings={readings}
          styles={styles}
          hasAlerts={Object.values(markers ?? {}).some((list) => list.some((m) => m.timeMs >= readings.fromMs && m.timeMs <= readings.toMs))}
          hasObservations={observations.some((o) => o.timeMs >= readings.fromMs && o.timeMs <= readings.toMs)}
        />
      </div>
      {readings.benches.length === 0 ? (
        <p className="text-lg text-muted">This zone has no benches in use.</p>
      ) : (
        <div className="grid grid-cols-1 gap-4 lg:grid-cols-2">
          {WINDOWED_QUANTITIES.map((quantity) => (
            <PanelBoundary key={quantity}>
              <ZoneQuantityPanel
                quantity={quantity}
                readings={readings}
                zoneWindow={zoneWindows.find((w) => w.quantity === quantity)}
                unit={unit}
                range={range}
                styles={styles}
                observations={observations}
                markers={markers?.[quantity]}
              />
            </PanelBoundary>
          ))}
          {derived.dewPoint && (
            <PanelBoundary>
              <ZoneDerivedPanel kind="dewPoint" readings={readings} unit={unit} range={range} styles={styles} />
            </PanelBoundary>
          )}
          {derived.vpd && (
            <PanelBoundary>
              <ZoneDerivedPanel kind="vpd" readings={readings} unit={unit} range={range} styles={styles} />
            </PanelBoundary>
          )}
        </div>
      )}
      {(derived.dewPoint || derived.vpd) && (
        <p className="mt-3 text-base text-muted">
          Dew point and VPD are worked out from each interval&apos;s mean air temperature and humidity (dew point by the Magnus form, VPD after FAO-56).
        </p>
      )}
    </section>
  );
}

type Styles = ReadonlyMap<number, { color: string; dash: string }>;

function BenchKey({ readings, styles, hasAlerts, hasObservations }: { readings: ZoneReadings; styles: Styles; hasAlerts: boolean; hasObservations: boolean }) {
  return (
    <ul className="flex flex-wrap gap-x-4 gap-y-1 text-base" aria-label="Benches on the charts">
      {readings.benches.map((b) => {
        const style = styles.get(b.bench.id)!;
        return (
          <li key={b.bench.id} className="flex items-center gap-1.5">
            <svg width="28" height="8" aria-hidden="true" focusable="false">
              <line x1="0" y1="4" x2="28" y2="4" stroke={style.color} strokeWidth="3" strokeDasharray={style.dash || undefined} />
            </svg>
            {b.bench.name}
          </li>
        );
      })}
      <li className="flex items-center gap-1.5 text-muted">
        <span aria-hidden="true" className="text-low">
          ▼
        </span>
        <span aria-hidden="true" className="text-high">
          ▲
        </span>
        Out of its window
      </li>
      {hasAlerts && <AlertKeyItem />}
      {hasObservations && <ObservationKeyItem />}
    </ul>
  );
}

function ZoneQuantityPanel({
  quantity,
  readings,
  zoneWindow,
  unit,
  range,
  styles,
  observations,
  markers,
}: {
  quantity: WindowedQuantity;
  readings: ZoneReadings;
  zoneWindow: QuantityWindow | undefined;
  unit: TemperatureUnit;
  range: ChartRange;
  styles: Styles;
  observations: readonly ObservationMarker[];
  markers?: readonly ChartMarker[];
}) {
  const headingId = `zone-chart-${quantity.replace(".", "-")}`;
  const values: number[] = [];
  const series: LineSeries[] = [];
  const stretches: OutOfWindowStretch[] = [];
  const outByBench: { name: string; outMs: number; hasWindow: boolean }[] = [];
  for (const b of readings.benches) {
    const window = b.windows.find((w) => w.quantity === quantity);
    const points = seriesOf(b, quantity);
    const chartPoints = toChartPoints(points, quantity, unit, readings.bucketMs, window).filter((p) => p.mean !== null);
    const style = styles.get(b.bench.id)!;
    series.push({
      key: `bench-${b.bench.id}`,
      label: b.bench.name,
      ...style,
      points: chartPoints.map((p) => ({ timeMs: p.timeMs, value: p.mean!, status: p.status })),
    });
    for (const p of chartPoints) values.push(p.mean!);
    stretches.push(...outOfWindowStretches(chartPoints, readings.bucketMs));
    const summary = summarizeSeries(points, readings.bucketMs, window);
    if (summary) outByBench.push({ name: b.bench.name, outMs: summary.outMs, hasWindow: summary.hasWindow });
  }
  if (zoneWindow) values.push(toDisplayValue(quantity, zoneWindow.min, unit), toDisplayValue(quantity, zoneWindow.max, unit));
  const hasData = series.some((s) => s.points.length > 0);
  const unitLabel = displayUnit(quantity, unit);

  return (
    <figure aria-labelledby={headingId} data-quantity={quantity} className="rounded-2xl border-2 border-line bg-surface p-3 sm:p-4">
      <div className="mb-2 flex flex-wrap items-baseline justify-between gap-x-3">
        <h3 id={headingId} className="text-lg font-bold">
          {QUANTITY_LABELS[quantity]}
        </h3>
        {zoneWindow && <span className="text-base text-muted">Zone window {formatWindowRange(zoneWindow, unit)}</span>}
      </div>
      {!hasData ? (
        <p className="flex h-40 items-center justify-center text-lg text-muted">No readings {describeRangeInSentence(range)}</p>
      ) : (
        <MultiLineChart
          series={series}
          fromMs={readings.fromMs}
          toMs={readings.toMs}
          bucketMs={readings.bucketMs}
          axis={niceAxis(Math.min(...values), Math.max(...values), displayDecimals(quantity) > 0 ? 2 : 4)}
          band={zoneWindow ? { y1: toDisplayValue(quantity, zoneWindow.min, unit), y2: toDisplayValue(quantity, zoneWindow.max, unit) } : undefined}
          stretches={stretches}
          formatValue={(v) => `${v.toFixed(displayDecimals(quantity))} ${unitLabel}`}
          observations={observations}
          markers={markers}
        />
      )}
      {hasData && <ObservationLane markers={observations} fromMs={readings.fromMs} toMs={readings.toMs} />}
      {outByBench.some((b) => b.hasWindow) && (
        <figcaption className="mt-2 flex flex-wrap gap-x-4 gap-y-1 text-base">
          <span className="text-muted">Out of window:</span>
          {outByBench
            .filter((b) => b.hasWindow)
            .map((b) => (
              <span key={b.name}>
                {b.name} <strong>{formatDuration(b.outMs)}</strong>
              </span>
            ))}
        </figcaption>
      )}
    </figure>
  );
}

function ZoneDerivedPanel({ kind, readings, unit, range, styles }: { kind: "dewPoint" | "vpd"; readings: ZoneReadings; unit: TemperatureUnit; range: ChartRange; styles: Styles }) {
  const isDew = kind === "dewPoint";
  const headingId = `zone-chart-${kind}`;
  const values: number[] = [];
  const series: LineSeries[] = readings.benches.map((b) => {
    const points = derivedPoints(seriesOf(b, "air.temperature"), seriesOf(b, "air.humidity")).map((p) => {
      const value = isDew ? toDisplayValue("air.temperature", p.dewPointC, unit) : p.vpdKPa;
      values.push(value);
      return { timeMs: p.timeMs, value, status: "unknown" as const };
    });
    return { key: `bench-${b.bench.id}`, label: b.bench.name, ...styles.get(b.bench.id)!, points };
  });
  const unitLabel = isDew ? displayUnit("air.temperature", unit) : "kPa";
  return (
    <figure aria-labelledby={headingId} data-quantity={kind} className="rounded-2xl border-2 border-line bg-surface p-3 sm:p-4">
      <div className="mb-2 flex flex-wrap items-baseline justify-between gap-x-3">
        <h3 id={headingId} className="text-lg font-bold">
          {isDew ? "Dew point" : "Vapour-pressure deficit (VPD)"}
        </h3>
        <span className="text-base text-muted">{unitLabel}</span>
      </div>
      {values.length === 0 ? (
        <p className="flex h-40 items-center justify-center text-lg text-muted">No air temperature and humidity {describeRangeInSentence(range)}</p>
      ) : (
        <MultiLineChart
          series={series}
          fromMs={readings.fromMs}
          toMs={readings.toMs}
          bucketMs={readings.bucketMs}
          axis={niceAxis(Math.min(...values), Math.max(...values), isDew ? 2 : 0.4)}
          formatValue={(v) => `${v.toFixed(isDew ? 1 : 2)} ${unitLabel}`}
        />
      )}
    </figure>
  );
}
