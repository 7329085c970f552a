import { Area, CartesianGrid, ComposedChart, Line, ReferenceArea, Tooltip, XAxis, YAxis } from "recharts";
import type { TooltipContentProps } from "recharts";
import { formatQuantity, toDisplayValue, type TemperatureUnit } from "../../../../shared/domain/units.js";
import type { WindowedQuantity } from "../../../../shared/schemas/quantities.js";
import type { SeriesPoint } from "../../../../shared/schemas/readings.js";
import type { QuantityWindow } from "../../../../shared/schemas/windows.js";
import { formatClockTime, formatDateTime } from "../../../lib/format-time";
import { describeStatus } from "../../../lib/quantity-labels";
import { chartAxis, hourTicks, toChartPoints, type ChartPoint } from "../utils/chart-points";

type ReadingChartProps = {
  quantity: WindowedQuantity;
  points: readonly SeriesPoint[];
  window: QuantityWindow | undefined;
  unit: TemperatureUnit;
  fromMs: number;
  toMs: number;
  bucketMs: number;
  heightPx?: number;
};

const AXIS_TICK = { fill: "var(--bw-muted)", fontSize: 14 };

/**
 * One quantity over time: the mean as a line, the bucket's min–max as a light area, the rooting
 * window as a shaded band. Buckets whose mean is out of window get a marker (▼ below, ▲ above),
 * so the chart reads without colour too.
 */
export function ReadingChart({ quantity, points, window, unit, fromMs, toMs, bucketMs, heightPx = 220 }: ReadingChartProps) {
  const data = toChartPoints(points, quantity, unit, bucketMs, window);
  const axis = chartAxis(data, quantity, unit, window);

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
        ticks={hourTicks(fromMs, toMs, 6)}
        tickFormatter={(t: number) => formatClockTime(t)}
        tick={AXIS_TICK}
        stroke="var(--bw-line)"
      />
      <YAxis
        domain={axis.domain}
        ticks={axis.ticks}
        width={48}
        tickFormatter={(v: number) => v.toFixed(axis.decimals)}
        tick={AXIS_TICK}
        stroke="var(--bw-line)"
      />
      {window && (
        <ReferenceArea
          y1={toDisplayValue(quantity, window.min, unit)}
          y2={toDisplayValue(quantity, window.max, unit)}
          fill="var(--bw-chart-band)"
          fillOpacity={0.2}
          stroke="var(--bw-chart-band)"
          strokeOpacity={0.7}
          strokeDasharray="6 4"
        />
      )}
      <Area
        dataKey="range"
        stroke="none"
        fill="var(--bw-chart-range)"
        fillOpacity={0.35}
        connectNulls={false}
        isAnimationActive={false}
        activeDot={false}
      />
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
        content={(props) => <ChartTooltip {...props} quantity={quantity} unit={unit} />}
        cursor={{ stroke: "var(--bw-muted)", strokeWidth: 1 }}
      />
    </ComposedChart>
  );
}

type DotProps = { cx?: number; cy?: number; payload?: ChartPoint; index?: number };

function OutOfWindowDot({ cx, cy, payload, index }: DotProps) {
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

type ChartTooltipProps = Partial<TooltipContentProps> & { quantity: WindowedQuantity; unit: TemperatureUnit };

function ChartTooltip({ active, payload, quantity, unit }: ChartTooltipProps) {
  const point = payload?.[0]?.payload as ChartPoint | undefined;
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
      {point.status !== "unknown" && <div className="font-semibold">{describeStatus(quantity, point.status)}</div>}
    </div>
  );
}
