import { CartesianGrid, ComposedChart, Line, ReferenceArea, Tooltip, XAxis, YAxis } from "recharts";
import type { TooltipContentProps } from "recharts";
import type { WindowStatus } from "../../../../shared/schemas/windows.js";
import { formatDateTime } from "../../../lib/format-time";
import { timeAxis, type OutOfWindowStretch } from "../utils/chart-points";
import type { ObservationMarker } from "./observation-lane";
import { AXIS_TICK, STRETCH_FILL, STRETCH_OPACITY, alertLines, observationLines, type ChartMarker } from "./reading-chart";

/** One line of a chart with several (a zone's benches, a derived quantity): values in display units. */
export type LineSeries = {
  key: string;
  label: string;
  color: string;
  /** SVG dash pattern, so lines differ by more than colour. */
  dash?: string;
  points: readonly { timeMs: number; value: number; status: WindowStatus }[];
};

/**
 * Colours and dashes for up to eight lines, mid-tones that read on the light and the dark page.
 * The ninth line reuses the first colour with another dash.
 */
const LINE_COLORS = ["#2a6f97", "#b25a1c", "#3d8a3d", "#8a4fa3", "#9a7b00", "#2f8a8a", "#b03a63", "#6b6f73"];
const LINE_DASHES = ["", "7 4", "2 4", "10 4 2 4"];

export function lineStyle(index: number): { color: string; dash: string } {
  return { color: LINE_COLORS[index % LINE_COLORS.length]!, dash: LINE_DASHES[Math.floor(index / 2) % LINE_DASHES.length]! };
}

type Row = { timeMs: number } & Record<string, number | null | string>;

/** A gap longer than this many buckets breaks the line (as on the single-bench chart). */
const GAP_BUCKETS = 2.5;

function mergeSeries(series: readonly LineSeries[], bucketMs: number): Row[] {
  const rows = new Map<number, Row>();
  const row = (timeMs: number) => {
    let r = rows.get(timeMs);
    if (!r) {
      r = { timeMs };
      rows.set(timeMs, r);
    }
    return r;
  };
  for (const s of series) {
    let previous: number | undefined;
    for (const p of [...s.points].sort((a, b) => a.timeMs - b.timeMs)) {
      if (previous !== undefined && p.timeMs - previous > GAP_BUCKETS * bucketMs) row(previous + bucketMs)[s.key] = null;
      const r = row(p.timeMs);
      r[s.key] = p.value;
      r[`${s.key}:status`] = p.status;
      previous = p.timeMs;
    }
  }
  return [...rows.values()].sort((a, b) => a.timeMs - b.timeMs);
}

type MultiLineChartProps = {
  series: readonly LineSeries[];
  fromMs: number;
  toMs: number;
  bucketMs: number;
  axis: { domain: [number, number]; ticks: number[]; decimals: number };
  /** The window, display units. */
  band?: { y1: number; y2: number };
  stretches?: readonly OutOfWindowStretch[];
  formatValue: (displayValue: number) => string;
  heightPx?: number;
  /** Observations to mark with a thin solid line (their ◇ sits in the lane under the chart). */
  observations?: readonly ObservationMarker[];
  /** Alerts raised in the range, each a dashed line labelled ⚠ (as on the single-bench chart). */
  markers?: readonly ChartMarker[];
};

/**
 * Several lines over one time axis: a zone's benches (each a mean line with ▼▲ where it leaves
 * its own window), or a derived quantity such as VPD.
 */
export function MultiLineChart({ series, fromMs, toMs, bucketMs, axis, band, stretches = [], formatValue, heightPx = 240, observations = [], markers = [] }: MultiLineChartProps) {
  const data = mergeSeries(series, bucketMs);
  const time = timeAxis(fromMs, toMs);
  return (
    <ComposedChart data={data} responsive style={{ width: "100%", height: heightPx }} margin={{ top: 8, right: 12, bottom: 0, left: 0 }}>
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
      <YAxis domain={axis.domain} ticks={axis.ticks} width={52} tickFormatter={(v: number) => v.toFixed(axis.decimals)} tick={AXIS_TICK} stroke="var(--bw-line)" />
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
      {band && (
        <ReferenceArea
          y1={band.y1}
          y2={band.y2}
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
      {series.map((s) => (
        <Line
          key={s.key}
          dataKey={s.key}
          name={s.label}
          stroke={s.color}
          strokeDasharray={s.dash || undefined}
          strokeWidth={2.25}
          connectNulls={false}
          isAnimationActive={false}
          dot={(props: DotProps) => <StatusDot {...props} seriesKey={s.key} key={`${s.key}-${props.index}`} />}
          activeDot={{ r: 4 }}
        />
      ))}
      <Tooltip content={(props) => <MultiTooltip {...props} series={series} formatValue={formatValue} />} cursor={{ stroke: "var(--bw-muted)", strokeWidth: 1 }} />
    </ComposedChart>
  );
}

type DotProps = { cx?: number; cy?: number; payload?: Row; index?: number };

function StatusDot({ cx, cy, payload, seriesKey }: DotProps & { seriesKey: string }) {
  const status = payload?.[`${seriesKey}:status`];
  if (cx === undefined || cy === undefined || payload?.[seriesKey] == null) return <g />;
  if (status === "below") return <path d={`M${cx - 4},${cy - 3}h8l-4,7z`} fill="var(--bw-low)" />;
  if (status === "above") return <path d={`M${cx - 4},${cy + 3}h8l-4,-7z`} fill="var(--bw-high)" />;
  return <g />;
}

type MultiTooltipProps = Partial<TooltipContentProps> & { series: readonly LineSeries[]; formatValue: (v: number) => string };

function MultiTooltip({ active, payload, series, formatValue }: MultiTooltipProps) {
  const row = payload?.[0]?.payload as Row | undefined;
  if (!active || !row) return null;
  const values = series.flatMap((s) => (typeof row[s.key] === "number" ? [{ s, value: row[s.key] as number, status: row[`${s.key}:status`] }] : []));
  if (values.length === 0) return null;
  return (
    <div className="rounded-lg border-2 border-line bg-surface px-3 py-2 text-base shadow-md">
      <div className="font-semibold">{formatDateTime(row.timeMs)}</div>
      {values.map(({ s, value, status }) => (
        <div key={s.key} className="flex items-center gap-2">
          <span className="inline-block h-1 w-4 rounded" style={{ background: s.color }} aria-hidden="true" />
          {s.label} <strong>{formatValue(value)}</strong>
          {status === "below" && <span className="text-low">▼</span>}
          {status === "above" && <span className="text-high">▲</span>}
        </div>
      ))}
    </div>
  );
}
