import type { QueryClient } from "@tanstack/react-query";
import type { AlertView } from "../../../../shared/schemas/alerts.js";
import { getAlertQueryOptions } from "../api/get-alert";
import { ALERT_LISTS_KEY, type AlertFilters } from "../api/get-alerts";

type AlertListData = { alerts: AlertView[] };

/** Whether an alert belongs in a list with these filters (the server's rule, alerts.service.ts). */
export function matchesAlertFilters(alert: AlertView, filters: AlertFilters): boolean {
  if (filters.phase) {
    if (alert.phase !== filters.phase) return false;
  } else if (filters.status === "open" && alert.phase === "cleared") {
    return false;
  } else if (filters.status === "past" && alert.phase !== "cleared") {
    return false;
  }
  if (filters.zoneId !== undefined && alert.zoneId !== filters.zoneId) return false;
  if (filters.kind !== undefined && alert.kind !== filters.kind) return false;
  return true;
}

/**
 * A list with changed alerts applied: replaced where they still belong, removed where they no
 * longer do (a cleared alert leaves the open lists), added where they now do; newest first like
 * the server, at most `limit`. Returns the same array when nothing changed.
 */
export function applyAlertsToList(list: readonly AlertView[], changed: readonly AlertView[], filters: AlertFilters): readonly AlertView[] {
  let next: AlertView[] | null = null;
  for (const alert of changed) {
    const current: readonly AlertView[] = next ?? list;
    const index = current.findIndex((a) => a.id === alert.id);
    const belongs = matchesAlertFilters(alert, filters);
    if (index >= 0) next = belongs ? current.map((a, i) => (i === index ? alert : a)) : current.filter((_, i) => i !== index);
    else if (belongs) next = [...current, alert];
  }
  if (next === null) return list;
  next.sort((a, b) => b.sinceMs - a.sinceMs || b.id - a.id);
  return filters.limit !== undefined ? next.slice(0, filters.limit) : next;
}

/**
 * Puts changed alerts (from the stream or an acknowledgement's answer) into every cached alert
 * list and detail, so the pages show them without asking the server again.
 */
export function updateAlertQueries(queryClient: QueryClient, changed: readonly AlertView[]): void {
  if (changed.length === 0) return;
  for (const query of queryClient.getQueryCache().findAll({ queryKey: ALERT_LISTS_KEY })) {
    const filters = query.queryKey[2] as AlertFilters | undefined;
    if (!filters) continue;
    queryClient.setQueryData<AlertListData>(query.queryKey, (current) => {
      if (!current) return current;
      const alerts = applyAlertsToList(current.alerts, changed, filters);
      return alerts === current.alerts ? current : { ...current, alerts: [...alerts] };
    });
  }
  for (const alert of changed) {
    const queryKey = getAlertQueryOptions(alert.id).queryKey;
    if (queryClient.getQueryData(queryKey)) queryClient.setQueryData(queryKey, { alert });
  }
}
