import { QueryClient, QueryObserver } from "@tanstack/react-query";
import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import type { ReadingEvent } from "../../shared/schemas/stream.js";
import type { ZonesResponse } from "../../shared/schemas/zones.js";
import { getBenchReadingsQueryOptions } from "../features/readings/api/get-bench-readings";
import { getZonesQueryOptions } from "../features/zones/api/get-zones";
import { NOW_MS, makeBench, makeZone, makeZones } from "../testing/data";
import { createReadingsHandler, type ReadingsHandler } from "./live-updates";

const zonesKey = getZonesQueryOptions().queryKey;

function event(readings: Partial<ReadingEvent>[]) {
  return {
    readings: readings.map((r) => ({
      benchId: 1,
      sensorId: "probe-1",
      quantity: "air.temperature" as const,
      value: 24,
      timeMs: NOW_MS,
      status: "inside" as const,
      ...r,
    })),
  };
}

function bench(queryClient: QueryClient, benchId: number) {
  const data = queryClient.getQueryData<ZonesResponse>(zonesKey);
  return data?.zones.flatMap((z) => z.benches).find((b) => b.id === benchId);
}

describe("createReadingsHandler", () => {
  let queryClient: QueryClient;
  let handler: ReadingsHandler;

  beforeEach(() => {
    queryClient = new QueryClient({ defaultOptions: { queries: { retry: false } } });
    queryClient.setQueryData(
      zonesKey,
      makeZones([
        makeZone({ id: 1, benches: [makeBench({ id: 1 }), makeBench({ id: 2, name: "Bench 2", position: 2 })] }),
        makeZone({ id: 2, name: "Graft house", benches: [makeBench({ id: 3, name: "Bench 3", zoneId: 2 })] }),
      ]),
    );
  });

  afterEach(() => handler.dispose());

  it("writes the latest value and status into the zones cache and recomputes the bench status", () => {
    handler = createReadingsHandler(queryClient);
    const before = queryClient.getQueryData<ZonesResponse>(zonesKey);

    handler.handleReadings(event([{ benchId: 1, quantity: "air.temperature", value: 15.5, status: "below", timeMs: NOW_MS }]));

    const updated = bench(queryClient, 1);
    const air = updated?.latest.find((l) => l.quantity === "air.temperature");
    expect(air).toMatchObject({ value: 15.5, status: "below", timeMs: NOW_MS });
    expect(updated?.status).toBe("below");
    expect(updated?.sensors[0]?.lastSeenMs).toBe(NOW_MS);
    // Untouched benches and zones keep their identity, so their cards do not re-render.
    const after = queryClient.getQueryData<ZonesResponse>(zonesKey);
    expect(after?.zones[1]).toBe(before?.zones[1]);
    expect(after?.zones[0]?.benches[1]).toBe(before?.zones[0]?.benches[1]);

    handler.handleReadings(event([{ benchId: 1, quantity: "air.temperature", value: 23, status: "inside", timeMs: NOW_MS + 5_000 }]));
    expect(bench(queryClient, 1)?.status).toBe("inside");
  });

  it("adds a quantity the bench had no value for and ignores a reading older than the one shown", () => {
    queryClient.setQueryData(zonesKey, makeZones([makeZone({ benches: [makeBench({ id: 1, latest: [], status: "unknown" })] })]));
    handler = createReadingsHandler(queryClient);

    handler.handleReadings(event([{ quantity: "medium.moisture", value: 0.7, status: "above", timeMs: NOW_MS }]));
    handler.handleReadings(event([{ quantity: "medium.moisture", value: 0.3, status: "inside", timeMs: NOW_MS - 60_000 }]));

    const updated = bench(queryClient, 1);
    expect(updated?.latest).toHaveLength(1);
    expect(updated?.latest[0]).toMatchObject({ quantity: "medium.moisture", value: 0.7, status: "above" });
    expect(updated?.status).toBe("above");
  });

  it("refetches the zones list when a reading names a bench it does not hold", () => {
    handler = createReadingsHandler(queryClient);
    const invalidate = vi.spyOn(queryClient, "invalidateQueries");
    handler.handleReadings(event([{ benchId: 99 }]));
    expect(invalidate).toHaveBeenCalledWith({ queryKey: zonesKey });
  });

  it("invalidates the open bench's series at most once per 30 s, with a trailing refresh", async () => {
    vi.useFakeTimers();
    let nowMs = NOW_MS;
    handler = createReadingsHandler(queryClient, { now: () => nowMs });
    const seriesOptions = getBenchReadingsQueryOptions({ benchId: 1 });
    const fetchSeries = vi.fn(async () => ({}) as never);
    // An open bench page = an observed (active) series query, last fetched at NOW_MS.
    queryClient.setQueryData(seriesOptions.queryKey, {} as never, { updatedAt: NOW_MS });
    const observer = new QueryObserver(queryClient, { ...seriesOptions, queryFn: fetchSeries, staleTime: Infinity, refetchInterval: false });
    const unsubscribe = observer.subscribe(() => {});
    const invalidate = vi.spyOn(queryClient, "invalidateQueries");
    const seriesInvalidations = () =>
      invalidate.mock.calls.filter(([filters]) => JSON.stringify(filters?.queryKey) === JSON.stringify(seriesOptions.queryKey)).length;

    nowMs = NOW_MS + 10_000;
    handler.handleReadings(event([{ benchId: 1 }]));
    handler.handleReadings(event([{ benchId: 1 }]));
    expect(seriesInvalidations()).toBe(0);

    // Bench 2 has no open page: its series is left alone.
    handler.handleReadings(event([{ benchId: 2 }]));
    expect(invalidate.mock.calls.some(([f]) => JSON.stringify(f?.queryKey).includes('"benchId":2'))).toBe(false);

    await vi.advanceTimersByTimeAsync(20_000);
    expect(seriesInvalidations()).toBe(1);
    expect(fetchSeries).toHaveBeenCalledTimes(1);

    unsubscribe();
  });

  it("refetches everything after the stream reconnects", () => {
    handler = createReadingsHandler(queryClient);
    const invalidate = vi.spyOn(queryClient, "invalidateQueries");
    handler.handleReconnect();
    expect(invalidate).toHaveBeenCalledWith({ queryKey: zonesKey });
    expect(invalidate).toHaveBeenCalledWith({ queryKey: ["readings", "series"] });
  });
});
