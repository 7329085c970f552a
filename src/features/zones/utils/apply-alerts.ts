import type { AlertView } from "../../../../shared/schemas/alerts.js";
import type { BenchSummary, ZonesResponse } from "../../../../shared/schemas/zones.js";

function applyToBench(bench: BenchSummary, changed: readonly AlertView[]): BenchSummary {
  const before = bench.alerts ?? [];
  let alerts = before;
  for (const alert of changed) {
    const isOpen = alert.phase !== "cleared";
    const index = alerts.findIndex((a) => a.id === alert.id);
    if (index >= 0) alerts = isOpen ? alerts.map((a, i) => (i === index ? alert : a)) : alerts.filter((_, i) => i !== index);
    else if (isOpen) alerts = [...alerts, alert];
  }
  if (alerts === before) return bench;
  // Oldest first, as GET /api/zones sends them.
  return { ...bench, alerts: [...alerts].sort((a, b) => a.sinceMs - b.sinceMs || a.id - b.id) };
}

/**
 * The zones list with changed alerts applied to their benches' open alerts: replaced by id,
 * added when new, removed once cleared. Unchanged zones and benches keep their identity.
 * `unknownBenchIds`: benches the list does not hold (added since it was fetched).
 */
export function applyAlertsToZones(zones: ZonesResponse, changed: readonly AlertView[]): { zones: ZonesResponse; unknownBenchIds: number[] } {
  const byBench = new Map<number, AlertView[]>();
  for (const alert of changed) byBench.set(alert.benchId, [...(byBench.get(alert.benchId) ?? []), alert]);
  const seen = new Set<number>();
  let isChanged = false;
  const nextZones = zones.zones.map((zone) => {
    let isZoneChanged = false;
    const benches = zone.benches.map((bench) => {
      const benchAlerts = byBench.get(bench.id);
      if (!benchAlerts) return bench;
      seen.add(bench.id);
      const next = applyToBench(bench, benchAlerts);
      if (next !== bench) isZoneChanged = true;
      return next;
    });
    if (!isZoneChanged) return zone;
    isChanged = true;
    return { ...zone, benches };
  });
  const unknownBenchIds = [...byBench.entries()].filter(([id, list]) => !seen.has(id) && list.some((a) => a.phase !== "cleared")).map(([id]) => id);
  return { zones: isChanged ? { ...zones, zones: nextZones } : zones, unknownBenchIds };
}
