// Test data for the settings pages' tests; nothing in the app imports this file.
import type { AuditEntry, AuditResponse } from "../../../../shared/schemas/audit.js";
import type { LayoutResponse } from "../../../../shared/schemas/layout.js";
import type { BenchWindowsResponse, QuantityWindow, WindowPreset, WindowWarning, ZoneWindowsResponse } from "../../../../shared/schemas/windows.js";
import { NOW_MS, WINDOWS } from "../../../testing/data";

export const LAYOUT: LayoutResponse = {
  sites: [{ id: 1, name: "Hillside nursery", timeZone: "America/Chicago", createdAtMs: NOW_MS - 86_400_000, archivedAtMs: null }],
  zones: [
    { id: 1, siteId: 1, name: "Fig house", position: 0, archivedAtMs: null },
    { id: 2, siteId: 1, name: "Graft house", position: 1, archivedAtMs: null },
  ],
  benches: [
    { id: 1, zoneId: 1, name: "Bench 1", position: 0, archivedAtMs: null, sensors: [{ id: "probe-1", kind: "combined" }], hasWindowOverrides: false },
    { id: 2, zoneId: 1, name: "Bench 2", position: 1, archivedAtMs: null, sensors: [], hasWindowOverrides: true },
    { id: 3, zoneId: 1, name: "Bench 3", position: 2, archivedAtMs: null, sensors: [], hasWindowOverrides: false },
  ],
};

export function zoneWindows(overrides: Partial<ZoneWindowsResponse> = {}): ZoneWindowsResponse {
  return {
    zone: { id: 1, name: "Fig house", siteId: 1, siteName: "Hillside nursery", archived: false },
    windows: WINDOWS,
    dewPointMarginC: 2,
    warnings: [],
    benchOverrides: [],
    ...overrides,
  };
}

/** The guidance warning the server answers for an air minimum below about 70 °F (shared/domain/window-guidance.ts). */
export const AIR_MIN_WARNING: WindowWarning = {
  code: "air-min-below-rooting",
  quantity: "air.temperature",
  field: "min",
  message: "An air minimum below about 70 °F (21 °C) lets the house sit where rooting slows sharply.",
  threshold: 21,
  source: {
    basis: "common-practice",
    citation: "Common practice for fig and other subtropical fruit-tree cuttings: air 70–80 °F (21–27 °C), little rooting below about 70 °F",
    reference: "REFERENCES.md §6",
  },
};

export const PRESETS: WindowPreset[] = [
  {
    id: "warm-rooting",
    name: "Warm rooting",
    description: "Warm air, a warm medium.",
    builtIn: true,
    windows: WINDOWS,
    dewPointMarginC: 2,
    notes: [],
    createdAtMs: null,
    updatedAtMs: null,
  },
];

export function auditEntry(overrides: Partial<AuditEntry> = {}): AuditEntry {
  return {
    id: 7,
    atMs: NOW_MS - 60_000,
    actor: { userId: 2, name: "Mo Manager", role: "manager" },
    entityType: "zone-windows",
    entityId: "1",
    action: "updated",
    subject: "Fig house",
    siteId: 1,
    zoneId: 1,
    previousZoneId: null,
    benchId: null,
    changes: [],
    note: null,
    ...overrides,
  };
}

export function auditPage(entries: AuditEntry[] = []): AuditResponse {
  return { entries, nextBefore: null };
}

/** Bench 2 of the Fig house with its own air window (minimum 19 °C where the zone has 21 °C). */
export function benchWindows(ownAir: QuantityWindow | null = { ...WINDOWS[0]!, min: 19 }): BenchWindowsResponse {
  const zoneAir = WINDOWS[0]!;
  return {
    bench: { id: 2, name: "Bench 2", zoneId: 1, zoneName: "Fig house", archived: false },
    zone: { windows: WINDOWS, dewPointMarginC: 2 },
    overrides: { windows: ownAir ? [ownAir] : [], dewPointMarginC: null },
    effective: WINDOWS.map((w) =>
      w.quantity === "air.temperature" && ownAir
        ? { quantity: w.quantity, window: ownAir, source: "bench" as const, zoneWindow: zoneAir, differingFields: (["min", "max", "delayS", "hysteresis"] as const).filter((f) => ownAir[f] !== zoneAir[f]) }
        : { quantity: w.quantity, window: w, source: "zone" as const, zoneWindow: w, differingFields: [] },
    ),
    dewPointMargin: { valueC: 2, source: "zone", differsFromZone: false },
    warnings: [],
  };
}
