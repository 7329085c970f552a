import type { ReactNode } from "react";
import { Link } from "react-router-dom";
import type { TemperatureUnit } from "../../../../shared/domain/units.js";
import type { AlertView } from "../../../../shared/schemas/alerts.js";
import { PhasePill } from "../../../components/ui/phase-pill";
import { paths } from "../../../config/paths";
import { KIND_LABELS, PHASE_DESCRIPTIONS, alertQuantity, formatAlertValue, formatAlertWindow } from "../../../lib/alert-words";
import { formatDateTime } from "../../../lib/format-time";
import { QUANTITY_LABELS } from "../../../lib/quantity-labels";
import { describeAlertTime } from "../utils/alert-times";

function Row({ term, children }: { term: string; children: ReactNode }) {
  return (
    <div className="flex flex-col gap-0.5 border-b border-line py-2 sm:flex-row sm:gap-4">
      <dt className="shrink-0 text-base font-semibold text-muted sm:w-44">{term}</dt>
      <dd className="min-w-0 text-lg">{children}</dd>
    </div>
  );
}

/** Every field of one alert, in words and the user's unit. */
export function AlertDetails({ alert, unit, nowMs }: { alert: AlertView; unit: TemperatureUnit; nowMs: number }) {
  const quantity = alertQuantity(alert);
  const last = formatAlertValue(alert, alert.lastValue, unit);
  const worst = formatAlertValue(alert, alert.worstValue, unit);
  const window = formatAlertWindow(alert, unit);
  const time = describeAlertTime(alert, nowMs);
  return (
    <dl aria-label="Alert details" className="flex flex-col">
      <Row term="Phase">
        <span className="flex flex-col items-start gap-1">
          <PhasePill phase={alert.phase} />
          <span className="text-base text-muted">{PHASE_DESCRIPTIONS[alert.phase]}</span>
        </span>
      </Row>
      <Row term="Kind">{KIND_LABELS[alert.kind]}</Row>
      <Row term="Where">
        <Link to={paths.bench.to(alert.benchId)} className="font-bold text-accent underline underline-offset-4">
          {alert.benchName}
        </Link>
        , {alert.zoneName}
        {alert.siteName && <span className="text-muted"> · {alert.siteName}</span>}
      </Row>
      {quantity && <Row term="Quantity">{QUANTITY_LABELS[quantity]}</Row>}
      {alert.sensorId && <Row term="Sensor">{alert.sensorId}</Row>}
      {last && <Row term={alert.clearedAtMs === null ? "Latest value" : "Last value"}>{last}</Row>}
      {worst && (
        <Row term={alert.kind === "condensation" ? "Closest to dew point" : alert.direction === "above" ? "Highest" : "Lowest"}>{worst}</Row>
      )}
      {window && <Row term="Window">{window}</Row>}
      <Row term="Out of window since">{formatDateTime(alert.sinceMs)}</Row>
      <Row term={time.isOver ? "Lasted" : "So far"}>{time.duration}</Row>
      <Row term="People told">{alert.raisedAtMs === null ? "Not yet: the hold-off delay is running" : formatDateTime(alert.raisedAtMs)}</Row>
      {alert.escalatedAtMs !== null && <Row term="Managers told">{formatDateTime(alert.escalatedAtMs)}</Row>}
      <Row term="Acknowledged">
        {alert.acknowledgedAtMs === null ? (
          <span className="text-muted">{alert.phase === "cleared" ? "Not acknowledged before it cleared" : "Nobody yet"}</span>
        ) : (
          <>
            By <strong>{alert.acknowledgedByName ?? "someone"}</strong>, {formatDateTime(alert.acknowledgedAtMs)}
          </>
        )}
      </Row>
      {alert.acknowledgeNote && (
        <Row term="Note">
          <q className="italic">{alert.acknowledgeNote}</q>
        </Row>
      )}
      <Row term="Cleared">{alert.clearedAtMs === null ? <span className="text-muted">Not yet</span> : formatDateTime(alert.clearedAtMs)}</Row>
    </dl>
  );
}
