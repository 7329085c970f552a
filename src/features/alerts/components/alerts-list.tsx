import { useTemperatureUnit } from "../../../lib/temperature-unit";
import { useAlerts, type AlertFilters } from "../api/get-alerts";
import { AlertsTable } from "./alerts-table";

const PHASE_ORDER = { raised: 0, watching: 1, acknowledged: 2, cleared: 3 } as const;

type AlertsListProps = { filters: AlertFilters; isFiltered: boolean; nowMs: number };

/** The alerts of one tab and its filters, or a plain line when there are none. */
export function AlertsList({ filters, isFiltered, nowMs }: AlertsListProps) {
  const { data } = useAlerts(filters);
  const { unit } = useTemperatureUnit();
  const isOpenTab = filters.status === "open";
  if (data.alerts.length === 0) {
    return (
      <p className="rounded-xl border-2 border-line bg-surface p-4 text-lg" role="status">
        {isFiltered
          ? `No ${isOpenTab ? "open" : "past"} alerts match these filters.`
          : isOpenTab
            ? "No open alerts: every bench is in its window."
            : "No past alerts yet."}
      </p>
    );
  }
  // Open alerts: the ones nobody has taken yet first, then those still in their hold-off, then
  // the acknowledged; newest first within each (the server's order).
  const alerts = isOpenTab ? [...data.alerts].sort((a, b) => PHASE_ORDER[a.phase] - PHASE_ORDER[b.phase]) : data.alerts;
  const count = alerts.length;
  const heading = isOpenTab ? (count === 1 ? "1 open alert" : `${count} open alerts`) : count === 1 ? "1 past alert" : `${count} past alerts`;
  return (
    <section aria-labelledby="alerts-list-heading" className="flex flex-col gap-3">
      <h2 id="alerts-list-heading" className="text-2xl font-bold">
        {heading}
        {filters.limit !== undefined && count >= filters.limit && <span className="text-lg font-semibold text-muted"> (the latest {filters.limit})</span>}
      </h2>
      <AlertsTable alerts={alerts} unit={unit} nowMs={nowMs} caption={heading} />
    </section>
  );
}
