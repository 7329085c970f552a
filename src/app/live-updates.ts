import { useQueryClient, type QueryClient } from "@tanstack/react-query";
import { useEffect, useMemo } from "react";
import type { ReadingsEvent } from "../../shared/schemas/stream.js";
import { useReadingsStream, type StreamState } from "../features/live/hooks/use-readings-stream";
import { getBenchReadingsQueryOptions } from "../features/readings/api/get-bench-readings";
import { getZonesQueryOptions } from "../features/zones/api/get-zones";
import { applyReadingsToZones } from "../features/zones/utils/apply-readings";

/** The open bench's chart is refetched at most this often while readings stream in. */
export const SERIES_REFRESH_MS = 30_000;

export type ReadingsHandler = {
  handleReadings: (event: ReadingsEvent) => void;
  handleReconnect: () => void;
  dispose: () => void;
};

/**
 * What the live stream does to the cache (STYLE.md §4): each batch patches the zones list in
 * place (latest value, status, bench status), and the series of a bench whose page is open is
 * invalidated, throttled to once per `seriesRefreshMs` with a trailing refresh so the last
 * reading of a burst is not left out.
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
    handleReconnect() {
      // Readings may have been missed while the stream was down.
      void queryClient.invalidateQueries({ queryKey: zonesKey });
      void queryClient.invalidateQueries({ queryKey: ["readings", "series"] });
    },
    dispose() {
      for (const timer of pendingTimers.values()) clearTimeout(timer);
      pendingTimers.clear();
    },
  };
}

/** Connects the readings stream to the query cache for as long as the app is mounted. */
export function useLiveUpdates(): StreamState {
  const queryClient = useQueryClient();
  // dispose() only drops pending timers, so the handler stays usable after a StrictMode re-mount.
  const handler = useMemo(() => createReadingsHandler(queryClient), [queryClient]);
  useEffect(() => () => handler.dispose(), [handler]);
  return useReadingsStream({ onReadings: handler.handleReadings, onReconnect: handler.handleReconnect });
}
