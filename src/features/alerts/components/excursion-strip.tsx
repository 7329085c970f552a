import { formatClockTime } from "../../../lib/format-time";

type ExcursionStripProps = {
  /** The chart's time axis. */
  fromMs: number;
  toMs: number;
  /** The alert's span: out of window from `startMs` until `endMs` (null: still open). */
  startMs: number;
  endMs: number | null;
  /** Space the chart leaves left and right of its plot (y-axis width, margin), so the strip lines up. */
  insetLeftPx?: number;
  insetRightPx?: number;
};

/**
 * A bar under an alert's chart marking when the alert ran, drawn with a hatch and labelled with
 * its times, so the excursion reads on the chart without relying on colour.
 */
export function ExcursionStrip({ fromMs, toMs, startMs, endMs, insetLeftPx = 52, insetRightPx = 12 }: ExcursionStripProps) {
  const spanMs = Math.max(1, toMs - fromMs);
  const left = Math.min(100, Math.max(0, ((startMs - fromMs) / spanMs) * 100));
  const right = Math.min(100, Math.max(left, (((endMs ?? toMs) - fromMs) / spanMs) * 100));
  const label = `Alert ${formatClockTime(startMs)} – ${endMs === null ? "now" : formatClockTime(endMs)}`;
  return (
    <div style={{ paddingLeft: insetLeftPx, paddingRight: insetRightPx }} className="mt-1">
      <div className="relative h-3 rounded-sm bg-none-soft" role="img" aria-label={label}>
        <div
          className="absolute inset-y-0 rounded-sm border-2 border-high bg-[repeating-linear-gradient(135deg,var(--bw-high)_0_3px,transparent_3px_7px)]"
          style={{ left: `${left}%`, width: `${Math.max(0.5, right - left)}%` }}
        />
      </div>
      <p className="mt-1 text-base font-semibold" aria-hidden="true">
        {label}
      </p>
    </div>
  );
}
