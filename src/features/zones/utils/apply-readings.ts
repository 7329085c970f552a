import { combineStatuses } from "../../../../shared/domain/window-status.js";
import { WINDOWED_QUANTITIES, type Quantity } from "../../../../shared/schemas/quantities.js";
import type { ReadingEvent } from "../../../../shared/schemas/stream.js";
import type { BenchSummary, LatestReading, ZonesResponse } from "../../../../shared/schemas/zones.js";

const WINDOWED = new Set<Quantity>(WINDOWED_QUANTITIES);

function applyToBench(bench: BenchSummary, readings: readonly ReadingEvent[]): BenchSummary {
  let latest = bench.latest;
  let sensors = bench.sensors;
  for (const reading of readings) {
    const current = latest.find((l) => l.quantity === reading.quantity);
    // Readings can arrive out of order (QoS 1 re-sends, batches): never replace a newer value.
    if (!current || reading.timeMs >= current.timeMs) {
      const next: LatestReading = {
        quantity: reading.quantity,
        value: reading.value,
        timeMs: reading.timeMs,
        sensorId: reading.sensorId,
        status: reading.status,
      };
      latest = current ? latest.map((l) => (l === current ? next : l)) : [...latest, next];
    }
    sensors = sensors.map((s) =>
      s.id === reading.sensorId && (s.lastSeenMs === null || s.lastSeenMs < reading.timeMs)
        ? { ...s, lastSeenMs: reading.timeMs }
        : s,
    );
  }
  if (latest === bench.latest && sensors === bench.sensors) return bench;
  // Same rule as the server: the worst status over the windowed quantities that have a value.
  const status = combineStatuses(latest.filter((l) => WINDOWED.has(l.quantity)).map((l) => l.status));
  return { ...bench, latest, sensors, status };
}

/**
 * The zones list with stream readings applied: each bench's latest value, status and sensor
 * last-seen time, and the bench status recomputed. Unchanged zones and benches keep their
 * identity, so only the cards that changed re-render. `unknownBenchIds` are benches the list
 * does not hold yet (added since it was fetched): the caller should refetch.
 */
export function applyReadingsToZones(
  zones: ZonesResponse,
  readings: readonly ReadingEvent[],
): { zones: ZonesResponse; unknownBenchIds: number[] } {
  const byBench = new Map<number, ReadingEvent[]>();
  for (const reading of readings) {
    const list = byBench.get(reading.benchId);
    if (list) list.push(reading);
    else byBench.set(reading.benchId, [reading]);
  }
  const seen = new Set<number>();
  let isChanged = false;
  const nextZones = zones.zones.map((zone) => {
    let isZoneChanged = false;
    const benches = zone.benches.map((bench) => {
      const benchReadings = byBench.get(bench.id);
      if (!benchReadings) return bench;
      seen.add(bench.id);
      const next = applyToBench(bench, benchReadings);
      if (next !== bench) isZoneChanged = true;
      return next;
    });
    if (!isZoneChanged) return zone;
    isChanged = true;
    return { ...zone, benches };
  });
  const unknownBenchIds = [...byBench.keys()].filter((id) => !seen.has(id));
  return { zones: isChanged ? { ...zones, zones: nextZones } : zones, unknownBenchIds };
}
