import { useQueryClient, type QueryClient } from "@tanstack/react-query";
import { useEffect, useMemo } from "react";
import type { AlertView } from "../../shared/schemas/alerts.js";
import type { ReadingsEvent } from "../../shared/schemas/stream.js";
import { ACKNOWLEDGE_ALERT_MUTATION_KEY, type acknowledgeAlert } from "../features/alerts/api/acknowledge-alert";
import { ALERT_LISTS_KEY } from "../features/alerts/api/get-alerts";
import { updateAlertQueries } from "../features/alerts/utils/update-alert-queries";
import { useReadingsStream, type AlertsEvent, type StreamState } from "../features/live/hooks/use-readings-stream";
import { getBenchReadingsQueryOptions } from "../features/readings/api/get-bench-readings";
import { getZonesQueryOptions } from "../features/zones/api/get-zones";
import { applyAlertsToZones } from "../features/zones/utils/apply-alerts";
import { applyReadingsToZones } from "../features/zones/utils/apply-readings";

/** The open bench's chart is refetched at most this often while readings stream in. */
export const SERIES_REFRESH_MS = 30_000;

export type ReadingsHandler = {
  handleReadings: (event: ReadingsEvent) => void;
  handleAlerts: (event: AlertsEvent) => void;
  handleReconnect: () => void;
  dispose: () => void;
};

/**
 * What the live stream does to the cache (STYLE.md §4): each batch patches the zones list in
 * place (latest value, status, bench status), and the series of a bench whose page is open is
 * invalidated, throttled to once per `seriesRefreshMs` with a trailing refresh so the last
 * reading of a burst is not left out. Each "alerts" event replaces, adds or removes those alerts
 * in every cached alert list and detail and in the benches' open alerts of the zones list.
 */
export function createReadingsHandler(
  queryClient: QueryClient,
  { seriesRefreshMs = SERIES_REFRESH_MS, now = () => Date.now() }: { seriesRefreshMs?: number; now?: () => number } = {},
): ReadingsHandler {
  const zonesKey = getZonesQueryOptions().queryKey;
  const pendingTimers = new Map<number, ReturnType<typeof setTimeout>>();

  function refreshSeries(benchId: number) {
    // Partial match: covers every range of this bench's series.
    const queryKey = getBenchReadingsQueryOptions({ benchId }).queryKey;
    const open = queryClient.getQueryCache().findAll({ queryKey, type: "active" });
    if (open.length === 0 || pendingTimers.has(benchId)) return;
    const lastFetchMs = Math.max(...open.map((q) => q.state.dataUpdatedAt));
    const waitMs = lastFetchMs + seriesRefreshMs - now();
    if (waitMs <= 0) {
      void queryClient.invalidateQueries({ queryKey });
      return;
    }
    pendingTimers.set(
      benchId,
      setTimeout(() => {
        pendingTimers.delete(benchId);
        void queryClient.invalidateQueries({ queryKey });
      }, waitMs),
    );
  }

  return {
    handleReadings(event) {
      if (event.readings.length === 0) return;
      let hasUnknownBench = false;
      queryClient.setQueryData(zonesKey, (current) => {
        // Nothing cached yet: the first fetch will bring these readings anyway.
        if (!current) return current;
        const result = applyReadingsToZones(current, event.readings);
        hasUnknownBench = result.unknownBenchIds.length > 0;
        return result.zones;
      });
      // A bench the list does not know yet was added since it was fetched.
      if (hasUnknownBench) void queryClient.invalidateQueries({ queryKey: zonesKey });
      for (const benchId of new Set(event.readings.map((r) => r.benchId))) refreshSeries(benchId);
    },
    handleAlerts(event) {
      applyAlertChanges(queryClient, event.alerts);
    },
    handleReconnect() {
      // Readings and alert changes may have been missed while the stream was down.
      void queryClient.invalidateQueries({ queryKey: zonesKey });
      void queryClient.invalidateQueries({ queryKey: ["readings", "series"] });
      void queryClient.invalidateQueries({ queryKey: ALERT_LISTS_KEY });
    },
    dispose() {
      for (const timer of pendingTimers.values()) clearTimeout(timer);
      pendingTimers.clear();
    },
  };
}

/** Changed alerts into the alert queries and onto the bench cards (the zones list). */
export function applyAlertChanges(queryClient: QueryClient, alerts: readonly AlertView[]): void {
  if (alerts.length === 0) return;
  updateAlertQueries(queryClient, alerts);
  const zonesKey = getZonesQueryOptions().queryKey;
  let hasUnknownBench = false;
  queryClient.setQueryData(zonesKey, (current) => {
    if (!current) return current;
    const result = applyAlertsToZones(current, alerts);
    hasUnknownBench = result.unknownBenchIds.length > 0;
    return result.zones;
  });
  if (hasUnknownBench) void queryClient.invalidateQueries({ queryKey: zonesKey });
}

/**
 * Our own acknowledgement's answer goes onto the bench cards at once, without waiting for the
 * stream's copy (which may be down). Returns the unsubscribe function.
 */
function followAcknowledgements(queryClient: QueryClient): () => void {
  return queryClient.getMutationCache().subscribe((event) => {
    if (event.type !== "updated" || event.action.type !== "success") return;
    const key = event.mutation.options.mutationKey;
    if (key?.[0] !== ACKNOWLEDGE_ALERT_MUTATION_KEY[0] || key[1] !== ACKNOWLEDGE_ALERT_MUTATION_KEY[1]) return;
    const answer = event.action.data as Awaited<ReturnType<typeof acknowledgeAlert>>;
    applyAlertChanges(queryClient, [answer.alert]);
  });
}

/** Connects the live stream to the query cache for as long as the app is mounted. */
export function useLiveUpdates(): StreamState {
  const queryClient = useQueryClient();
  // dispose() only drops pending timers, so the handler stays usable after a StrictMode re-mount.
  const handler = useMemo(() => createReadingsHandler(queryClient), [queryClient]);
  useEffect(() => () => handler.dispose(), [handler]);
  useEffect(() => followAcknowledgements(queryClient), [queryClient]);
  return useReadingsStream({ onReadings: handler.handleReadings, onAlerts: handler.handleAlerts, onReconnect: handler.handleReconnect });
}
