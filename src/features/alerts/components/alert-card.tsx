import type { ReactNode } from "react";
import type { TemperatureUnit } from "../../../../shared/domain/units.js";
import type { AlertView } from "../../../../shared/schemas/alerts.js";
import { PhasePill } from "../../../components/ui/phase-pill";
import { alertTitle } from "../../../lib/alert-words";
import { describeAlertTime, formatMoment } from "../utils/alert-times";
import { AlertValue } from "./alert-value";

type AlertCardProps = {
  alert: AlertView;
  unit: TemperatureUnit;
  nowMs: number;
  /** A title that links somewhere (the detail page); plain words by default. */
  title?: ReactNode;
  /** Below the card's text: the acknowledge button. */
  action?: ReactNode;
};

/** One alert as a card, phone first: what, where, the value, since when, its phase and who took it. */
export function AlertCard({ alert, unit, nowMs, title, action }: AlertCardProps) {
  const time = describeAlertTime(alert, nowMs);
  const headingId = `alert-${alert.id}-title`;
  return (
    <article
      aria-labelledby={headingId}
      data-alert-id={alert.id}
      data-phase={alert.phase}
      className={`flex flex-col gap-2 rounded-xl bg-surface p-4 ${alert.phase === "raised" ? "border-4 border-high" : "border-2 border-line"}`}
    >
      <div className="flex flex-wrap items-start justify-between gap-2">
        <div className="min-w-0">
          <h3 id={headingId} className="text-2xl font-bold leading-tight">
            {title ?? alertTitle(alert)}
          </h3>
          <p className="text-lg">
            <strong>{alert.benchName}</strong> · {alert.zoneName}
          </p>
        </div>
        <PhasePill phase={alert.phase} />
      </div>
      <div className="text-lg">
        <AlertValue alert={alert} unit={unit} />
      </div>
      <p className="text-lg">
        {time.since} <span className="text-muted">({time.isOver ? `out for ${time.duration}` : `${time.duration} so far`})</span>
      </p>
      {alert.acknowledgedAtMs !== null && (
        <p className="text-lg">
          Acknowledged by <strong>{alert.acknowledgedByName ?? "someone"}</strong>, {formatMoment(alert.acknowledgedAtMs, nowMs)}
          {alert.acknowledgeNote && (
            <>
              : <q className="italic">{alert.acknowledgeNote}</q>
            </>
          )}
        </p>
      )}
      {action}
    </article>
  );
}
