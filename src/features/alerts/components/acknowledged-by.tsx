import type { AlertView } from "../../../../shared/schemas/alerts.js";
import { formatMoment } from "../utils/alert-times";

/** Who took the alert and when, with their note; a dash while nobody has. */
export function AcknowledgedBy({ alert, nowMs }: { alert: AlertView; nowMs: number }) {
  if (alert.acknowledgedAtMs === null) return <span className="text-muted">{alert.phase === "raised" ? "Nobody yet" : "—"}</span>;
  return (
    <span className="flex flex-col">
      <span>
        <strong>{alert.acknowledgedByName ?? "Someone"}</strong>, {formatMoment(alert.acknowledgedAtMs, nowMs)}
      </span>
      {alert.acknowledgeNote && <q className="text-base italic">{alert.acknowledgeNote}</q>}
    </span>
  );
}
