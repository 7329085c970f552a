// Test data builders for component tests only; nothing in the app imports this file.
import type { QuantityWindow } from "../../shared/schemas/windows.js";
import type { BenchSummary, LatestReading, ZoneSummary, ZonesResponse } from "../../shared/schemas/zones.js";

export const NOW_MS = Date.UTC(2025, 0, 15, 6, 0, 0);

/** A rooting window like the demo nursery's: air 21–27 °C, 60–90 %RH, medium 21–27 °C, 25–45 % VWC. */
export const WINDOWS: QuantityWindow[] = [
  { quantity: "air.temperature", min: 21, max: 27, delayS: 600, hysteresis: 0.5 },
  { quantity: "air.humidity", min: 60, max: 90, delayS: 600, hysteresis: 2 },
  { quantity: "medium.temperature", min: 21, max: 27, delayS: 600, hysteresis: 0.5 },
  { quantity: "medium.moisture", min: 0.25, max: 0.45, delayS: 600, hysteresis: 0.02 },
];

export function reading(quantity: LatestReading["quantity"], value: number, status: LatestReading["status"], ageMs = 60_000): LatestReading {
  return { quantity, value, status, timeMs: NOW_MS - ageMs, sensorId: "probe-1" };
}

export function makeBench(overrides: Partial<BenchSummary> = {}): BenchSummary {
  return {
    id: 1,
    name: "Bench 1",
    zoneId: 1,
    position: 1,
    sensors: [{ id: "probe-1", kind: "combined", lastSeenMs: NOW_MS - 60_000 }],
    windows: WINDOWS,
    latest: [
      reading("air.temperature", 24, "inside"),
      reading("air.humidity", 75, "inside"),
      reading("medium.temperature", 23, "inside"),
      reading("medium.moisture", 0.35, "inside"),
    ],
    status: "inside",
    ...overrides,
  };
}

export function makeZone(overrides: Partial<ZoneSummary> = {}): ZoneSummary {
  return { id: 1, name: "Fig house", siteId: 1, siteName: "Hillside nursery", benches: [makeBench()], ...overrides };
}

export function makeZones(zones: ZoneSummary[] = [makeZone()]): ZonesResponse {
  return { zones };
}
