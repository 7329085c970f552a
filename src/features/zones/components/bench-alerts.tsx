import { Link } from "react-router-dom";
import type { TemperatureUnit } from "../../../../shared/domain/units.js";
import type { AlertView } from "../../../../shared/schemas/alerts.js";
import { PHASE_BLOCK_CLASSES, PhaseIcon } from "../../../components/ui/phase-pill";
import { paths } from "../../../config/paths";
import { alertTitle, describeAlertPhase, formatAlertValue } from "../../../lib/alert-words";

/** Beyond this many, a card says "and N more" rather than growing without end. */
const MAX_LINES = 3;

/** Raised first (it needs someone), then watching, then acknowledged; oldest first within each. */
const PHASE_ORDER = { raised: 0, watching: 1, acknowledged: 2, cleared: 3 } as const;

type BenchAlertsProps = { alerts: readonly AlertView[]; unit: TemperatureUnit; benchName: string };

/**
 * A bench's open alerts on its card, one line each ("Raised 03:12 · Air too cold"), each a link
 * to the alert. They sit above the card's own link, so each line is its own touch target.
 */
export function BenchAlerts({ alerts, unit, benchName }: BenchAlertsProps) {
  if (alerts.length === 0) return null;
  const sorted = [...alerts].sort((a, b) => PHASE_ORDER[a.phase] - PHASE_ORDER[b.phase] || a.sinceMs - b.sinceMs);
  const shown = sorted.slice(0, MAX_LINES);
  const hidden = sorted.length - shown.length;
  return (
    <ul aria-label={`Open alerts on ${benchName}`} className="relative z-10 flex flex-col gap-1.5">
      {shown.map((alert) => {
        const value = formatAlertValue(alert, alert.lastValue, unit);
        return (
          <li key={alert.id}>
            <Link
              to={paths.alert.to(alert.id)}
              data-phase={alert.phase}
              className={`flex min-h-touch items-center gap-2 rounded-lg border-2 px-3 py-1.5 text-lg font-bold leading-snug hover:ring-2 hover:ring-accent ${PHASE_BLOCK_CLASSES[alert.phase]}`}
            >
              <PhaseIcon phase={alert.phase} className="size-6" />
              <span className="min-w-0">
                {describeAlertPhase(alert)} · {alertTitle(alert)}
                {value && <span className="font-semibold"> · {value}</span>}
              </span>
            </Link>
          </li>
        );
      })}
      {hidden > 0 && (
        <li className="text-base font-semibold text-muted">
          and {hidden} more {hidden === 1 ? "alert" : "alerts"}
        </li>
      )}
    </ul>
  );
}
