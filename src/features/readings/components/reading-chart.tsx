import { Area, CartesianGrid, ComposedChart, Line, ReferenceArea, ReferenceLine, Tooltip, XAxis, YAxis } from "recharts";
import type { TooltipContentProps } from "recharts";
import { formatQuantity, toDisplayValue, type TemperatureUnit } from "../../../../shared/domain/units.js";
import type { WindowedQuantity } from "../../../../shared/schemas/quantities.js";
import type { SeriesPoint } from "../../../../shared/schemas/readings.js";
import type { QuantityWindow } from "../../../../shared/schemas/windows.js";
import { formatDateTime } from "../../../lib/format-time";
import { describeStatus } from "../../../lib/quantity-labels";
import { chartAxis, outOfWindowStretches, timeAxis, toChartPoints, type ChartPoint } from "../utils/chart-points";
import type { ObservationMarker } from "./observation-lane";

/** A line worked out from other series (the dew point), drawn over the chart in the same unit. */
export type ExtraLine = {
  label: string;
  /** Display units, by bucket start. */
  values: ReadonlyMap<number, number>;
  format: (displayValue: number) => string;
};

/** A moment to mark on the chart (an alert raised), with a short label. */
export type ChartMarker = { timeMs: number; label: string };

type ReadingChartProps = {
  quantity: WindowedQuantity;
  points: readonly SeriesPoint[];
  window: QuantityWindow | undefined;
  unit: TemperatureUnit;
  fromMs: number;
  toMs: number;
  bucketMs: number;
  heightPx?: number;
  extraLine?: ExtraLine;
  markers?: readonly ChartMarker[];
  /** Observations to mark with a thin solid line (their ◇ sits in the lane under the chart). */
  observations?: readonly ObservationMarker[];
};

type PlotPoint = ChartPoint & { extra: number | null };

export const AXIS_TICK = { fill: "var(--bw-muted)", fontSize: 14 };

/** Shading of out-of-window stretches: light enough that the window band and the line stay readable. */
export const STRETCH_FILL = { below: "var(--bw-low)", above: "var(--bw-high)" } as const;
export const STRETCH_OPACITY = 0.14;

/**
 * One quantity over time: the mean as a line, the bucket's min–max as a light area, the rooting
 * window as a shaded band, and each stretch out of window shaded across the chart's height.
 * Buckets whose mean is out of window also get a marker (▼ below, ▲ above), so the chart reads
 * without colour too. An optional derived line (the dew point on the air chart) is dashed.
 */
export function ReadingChart({ quantity, points, window, unit, fromMs, toMs, bucketMs, heightPx = 220, extraLine, markers = [], observations = [] }: ReadingChartProps) {
  const chartPoints = toChartPoints(points, quantity, unit, bucketMs, window);
  const data: PlotPoint[] = chartPoints.map((p) => ({ ...p, extra: p.mean === null ? null : (extraLine?.values.get(p.timeMs) ?? null) }));
  const axis = chartAxis(chartPoints, quantity, unit, window, extraLine ? [...extraLine.values.values()] : []);
  const time = timeAxis(fromMs, toMs);
  const stretches = outOfWindowStretches(chartPoints, bucketMs);

  return (
    <ComposedChart
      data={data}
      responsive
      style={{ width: "100%", height: heightPx }}
      margin={{ top: 8, right: 12, bottom: 0, left: 0 }}
    >
      <CartesianGrid stroke="var(--bw-chart-grid)" vertical={false} />
      <XAxis
        dataKey="timeMs"
        type="number"
        scale="time"
        domain={[fromMs, toMs]}
        ticks={time.ticks}
        tickFormatter={time.format}
        tick={AXIS_TICK}
        stroke="var(--bw-line)"
        allowDataOverflow
      />
      <YAxis
        domain={axis.domain}
        ticks={axis.ticks}
        width={52}
        tickFormatter={(v: number) => v.toFixed(axis.decimals)}
        tick={AXIS_TICK}
        stroke="var(--bw-line)"
      />
      {stretches.map((s) => (
        <ReferenceArea
          key={`${s.status}-${s.startMs}`}
          x1={Math.max(s.startMs, fromMs)}
          x2={Math.min(s.endMs, toMs)}
          fill={STRETCH_FILL[s.status]}
          fillOpacity={STRETCH_OPACITY}
          stroke="none"
          className="bw-out-of-window"
        />
      ))}
      {window && (
        <ReferenceArea
          y1={toDisplayValue(quantity, window.min, unit)}
          y2={toDisplayValue(quantity, window.max, unit)}
          fill="var(--bw-chart-band)"
          fillOpacity={0.2}
          stroke="var(--bw-chart-band)"
          strokeOpacity={0.7}
          strokeDasharray="6 4"
          className="bw-window-band"
        />
      )}
      {observationLines(observations, fromMs, toMs)}
      {alertLines(markers, fromMs, toMs)}
      <Area
        dataKey="range"
        stroke="none"
        fill="var(--bw-chart-range)"
        fillOpacity={0.35}
        connectNulls={false}
        isAnimationActive={false}
        activeDot={false}
      />
      {extraLine && (
        <Line
          dataKey="extra"
          name={extraLine.label}
          stroke="var(--bw-accent)"
          strokeWidth={2}
          strokeDasharray="5 4"
          connectNulls={false}
          isAnimationActive={false}
          dot={false}
          activeDot={{ r: 4 }}
        />
      )}
      <Line
        dataKey="mean"
        stroke="var(--bw-chart-line)"
        strokeWidth={2.5}
        connectNulls={false}
        isAnimationActive={false}
        dot={OutOfWindowDot}
        activeDot={{ r: 5 }}
      />
      <Tooltip
        content={(props) => <ChartTooltip {...props} quantity={quantity} unit={unit} extraLine={extraLine} />}
        cursor={{ stroke: "var(--bw-muted)", strokeWidth: 1 }}
      />
    </ComposedChart>
  );
}

/** Each alert raised in the range as a dashed line in ink, labelled "⚠ " and its words at the top of the plot. */
export function alertLines(markers: readonly ChartMarker[], fromMs: number, toMs: number) {
  return markers
    .filter((m) => m.timeMs >= fromMs && m.timeMs <= toMs)
    .map((m) => (
      <ReferenceLine
        key={`${m.timeMs}-${m.label}`}
        x={m.timeMs}
        stroke="var(--bw-ink)"
        strokeWidth={2}
        strokeDasharray="2 3"
        className="bw-alert-marker"
        // In the right half the label reads leftwards from the line, so it is not cut off at the chart's edge.
        // A halo in the card's colour keeps it readable where an observation line or a series crosses it.
        label={{
          value: `⚠ ${m.label}`,
          position: m.timeMs - fromMs > (toMs - fromMs) / 2 ? "insideTopRight" : "insideTopLeft",
          fill: "var(--bw-ink)",
          fontSize: 13,
          stroke: "var(--bw-surface)",
          strokeWidth: 3,
          paintOrder: "stroke",
        }}
      />
    ));
}

/**
 * Each observation as a thin solid line in the accent colour across the plot: where it falls in the
 * series. An alert is a dashed line in ink with a ⚠ label; the two differ in dash and label, not
 * only in colour.
 */
export function observationLines(observations: readonly ObservationMarker[], fromMs: number, toMs: number) {
  return observations
    .filter((o) => o.timeMs >= fromMs && o.timeMs <= toMs)
    .map((o) => (
      <ReferenceLine key={`observation-${o.id}`} x={o.timeMs} stroke="var(--bw-accent)" strokeWidth={1.5} strokeOpacity={0.7} className="bw-observation-marker" />
    ));
}

type DotProps = { cx?: number; cy?: number; payload?: ChartPoint; index?: number };

export function OutOfWindowDot({ cx, cy, payload, index }: DotProps) {
  const key = `dot-${index}`;
  if (cx === undefined || cy === undefined || !payload || payload.mean === null) return <g key={key} />;
  if (payload.status === "below") {
    return <path key={key} d={`M${cx - 5},${cy - 4}h10l-5,8z`} fill="var(--bw-low)" />;
  }
  if (payload.status === "above") {
    return <path key={key} d={`M${cx - 5},${cy + 4}h10l-5,-8z`} fill="var(--bw-high)" />;
  }
  return <g key={key} />;
}

type ChartTooltipProps = Partial<TooltipContentProps> & { quantity: WindowedQuantity; unit: TemperatureUnit; extraLine?: ExtraLine };

function ChartTooltip({ active, payload, quantity, unit, extraLine }: ChartTooltipProps) {
  const point = payload?.[0]?.payload as PlotPoint | undefined;
  if (!active || !point?.si) return null;
  return (
    <div className="rounded-lg border-2 border-line bg-surface px-3 py-2 text-base shadow-md">
      <div className="font-semibold">{formatDateTime(point.timeMs)}</div>
      <div>
        Mean <strong>{formatQuantity(quantity, point.si.mean, unit)}</strong>
      </div>
      <div className="text-muted">
        Range {formatQuantity(quantity, point.si.min, unit)} – {formatQuantity(quantity, point.si.max, unit)}
      </div>
      {extraLine && point.extra !== null && (
        <div>
          {extraLine.label} <strong>{extraLine.format(point.extra)}</strong>
        </div>
      )}
      {point.status !== "unknown" && <div className="font-semibold">{describeStatus(quantity, point.status)}</div>}
    </div>
  );
}
