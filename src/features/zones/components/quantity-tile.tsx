import type { TemperatureUnit } from "../../../../shared/domain/units.js";
import type { WindowedQuantity } from "../../../../shared/schemas/quantities.js";
import type { QuantityWindow } from "../../../../shared/schemas/windows.js";
import type { LatestReading } from "../../../../shared/schemas/zones.js";
import { StatusIcon } from "../../../components/ui/status-icon";
import { STATUS_SURFACE, STATUS_TEXT } from "../../../components/ui/status-tone";
import { formatValueParts, formatWindowRange } from "../../../lib/display-value";
import { formatAge, formatDateTime, isStale } from "../../../lib/format-time";
import { QUANTITY_LABELS, QUANTITY_SHORT_LABELS, describeStatus } from "../../../lib/quantity-labels";

type QuantityTileProps = {
  quantity: WindowedQuantity;
  reading: LatestReading | undefined;
  window: QuantityWindow | undefined;
  unit: TemperatureUnit;
  nowMs: number;
  size?: "card" | "large";
};

/** One quantity of one bench: the latest value, where it stands (words + icon + colour), its age. */
export function QuantityTile({ quantity, reading, window, unit, nowMs, size = "card" }: QuantityTileProps) {
  const status = reading?.status ?? "unknown";
  const words = describeStatus(quantity, status, reading !== undefined);
  const value = reading ? formatValueParts(quantity, reading.value, unit) : null;
  const isOut = status === "below" || status === "above";
  const isOld = reading ? isStale(reading.timeMs, nowMs) : false;
  const secondary = isOut ? "text-on-status/90" : "text-muted";

  return (
    <div
      role="group"
      aria-label={QUANTITY_LABELS[quantity]}
      data-quantity={quantity}
      data-status={status}
      data-stale={isOld || undefined}
      className={`flex min-w-0 flex-col gap-1 rounded-xl border-2 p-3 ${STATUS_SURFACE[status]} ${isOld ? "border-dashed" : ""} ${
        size === "large" ? "sm:p-4" : ""
      }`}
    >
      <span className={`text-sm font-semibold uppercase tracking-wide ${secondary}`}>
        {size === "large" ? QUANTITY_LABELS[quantity] : QUANTITY_SHORT_LABELS[quantity]}
      </span>
      <span
        className={`font-bold leading-none tabular-nums ${size === "large" ? "text-5xl" : "text-4xl"}`}
      >
        {value ? (
          <>
            {value.number} <span className="text-xl font-semibold">{value.unit}</span>
          </>
        ) : (
          <span className="text-3xl" aria-hidden="true">
            —
          </span>
        )}
      </span>
      <span className={`mt-1 flex items-center gap-1.5 text-lg font-bold leading-tight ${STATUS_TEXT[status]}`}>
        <StatusIcon status={status} />
        <span>{words}</span>
      </span>
      {reading && (
        <span
          className={`flex items-center gap-1 text-sm ${isOld ? "font-bold" : secondary}`}
          title={formatDateTime(reading.timeMs)}
        >
          {isOld && <ClockIcon />}
          {isOld ? `Last reading ${formatAge(reading.timeMs, nowMs)}` : formatAge(reading.timeMs, nowMs)}
        </span>
      )}
      {window && <span className={`text-sm ${secondary}`}>Window {formatWindowRange(window, unit)}</span>}
    </div>
  );
}

/** Marks a reading old enough that its probe may have gone quiet. */
function ClockIcon() {
  return (
    <svg viewBox="0 0 24 24" className="size-4 shrink-0" fill="none" stroke="currentColor" strokeWidth={2.5} aria-hidden="true" focusable="false">
      <circle cx="12" cy="12" r="9.5" />
      <path d="M12 7v5l3 2" strokeLinecap="round" />
    </svg>
  );
}
