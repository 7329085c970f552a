import type { TemperatureUnit } from "../../../../shared/domain/units.js";
import type { AlertView } from "../../../../shared/schemas/alerts.js";
import { formatAlertValue, formatAlertWindow } from "../../../lib/alert-words";

/**
 * The value an alert is about, in the user's unit: the latest value with the window it left, and
 * the worst seen. For condensation the value is how far the air is above its dew point.
 */
export function AlertValue({ alert, unit }: { alert: AlertView; unit: TemperatureUnit }) {
  const last = formatAlertValue(alert, alert.lastValue, unit);
  const worst = alert.worstValue !== alert.lastValue ? formatAlertValue(alert, alert.worstValue, unit) : null;
  const window = formatAlertWindow(alert, unit);
  if (!last) {
    if (alert.kind !== "sensor-silent") return <span className="text-muted">—</span>;
    return <span className="text-muted">{alert.phase === "cleared" ? "Readings arriving again" : "No readings arriving"}</span>;
  }
  return (
    <span className="flex flex-col">
      <strong className="tabular-nums">{last}</strong>
      {window && <span className="text-base text-muted">Window {window}</span>}
      {worst && (
        <span className="text-base text-muted">
          {alert.kind === "condensation" ? "Closest" : alert.direction === "above" ? "Highest" : "Lowest"} {worst}
        </span>
      )}
    </span>
  );
}
