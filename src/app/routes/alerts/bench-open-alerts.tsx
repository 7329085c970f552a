import { Link } from "react-router-dom";
import { paths } from "../../../config/paths";
import { AcknowledgeButton } from "../../../features/alerts/components/acknowledge-button";
import { AlertCard } from "../../../features/alerts/components/alert-card";
import { useZones } from "../../../features/zones/api/get-zones";
import { alertTitle } from "../../../lib/alert-words";
import { useTemperatureUnit } from "../../../lib/temperature-unit";

/**
 * The bench page's open alerts (watching, raised, acknowledged), read from the live zones list so
 * an acknowledgement or a clearing shows at once; each with "I've got it" while it is raised.
 * Composed here because it joins two features: the zones list and the alert cards.
 */
export function BenchOpenAlerts({ benchId, nowMs }: { benchId: number; nowMs: number }) {
  const { data } = useZones();
  const { unit } = useTemperatureUnit();
  const bench = data.zones.flatMap((z) => z.benches).find((b) => b.id === benchId);
  const alerts = bench?.alerts ?? [];
  if (!bench || alerts.length === 0) return null;
  return (
    <section aria-labelledby="bench-alerts-heading" className="flex flex-col gap-3">
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h2 id="bench-alerts-heading" className="text-xl font-bold">
          {alerts.length === 1 ? "1 open alert" : `${alerts.length} open alerts`}
        </h2>
        <Link to={paths.alerts.to({ zoneId: bench.zoneId })} className="inline-flex min-h-touch items-center text-lg font-semibold text-accent underline underline-offset-4">
          Alerts in this zone
        </Link>
      </div>
      <ul className="grid gap-3 md:grid-cols-2">
        {alerts.map((alert) => (
          <li key={alert.id}>
            <AlertCard
              alert={alert}
              unit={unit}
              nowMs={nowMs}
              title={
                <Link to={paths.alert.to(alert.id)} className="text-accent underline underline-offset-4">
                  {alertTitle(alert)}
                </Link>
              }
              action={<AcknowledgeButton alert={alert} className="w-full sm:w-auto sm:self-start" />}
            />
          </li>
        ))}
      </ul>
    </section>
  );
}
