// Test data builders for component tests only; nothing in the app imports this file.
import type { AlertView } from "../../shared/schemas/alerts.js";
import type { Role, SessionResponse, User } from "../../shared/schemas/auth.js";
import type { SensorView } from "../../shared/schemas/sensors.js";
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

export function makeUser(overrides: Partial<User> = {}): User {
  return {
    id: 1,
    name: "Ada Admin",
    email: "admin@nursery.test",
    role: "admin",
    temperatureUnit: "F",
    disabled: false,
    hasPassword: true,
    createdAtMs: NOW_MS - 30 * 86_400_000,
    lastSignInMs: NOW_MS - 3_600_000,
    ...overrides,
  };
}

/** One signed-in user per role, like the demo nursery's. */
export const USERS: Record<Role, User> = {
  admin: makeUser(),
  manager: makeUser({ id: 2, name: "Mo Manager", email: "manager@nursery.test", role: "manager" }),
  grower: makeUser({ id: 3, name: "Gil Grower", email: "grower@nursery.test", role: "grower" }),
  viewer: makeUser({ id: 4, name: "Vi Viewer", email: "viewer@nursery.test", role: "viewer" }),
};

export function makeSession(user: User = USERS.admin): SessionResponse {
  return { user, expiresAtMs: Date.now() + 12 * 3_600_000, demo: true };
}

export function makeSensor(overrides: Partial<SensorView> = {}): SensorView {
  return {
    id: "probe-1",
    kind: "combined",
    benchId: 1,
    benchName: "Bench 1",
    zoneName: "Fig house",
    disabled: false,
    createdAtMs: NOW_MS - 86_400_000,
    lastSeenMs: Date.now() - 60_000,
    batteryPct: 87,
    calibration: {},
    ...overrides,
  };
}

/** An alert like the engine's: bench 1 of the fig house, air too cold, raised 10 min after it began. */
export function makeAlert(overrides: Partial<AlertView> = {}): AlertView {
  return {
    id: 1,
    kind: "window",
    phase: "raised",
    benchId: 1,
    benchName: "Bench 1",
    zoneId: 1,
    zoneName: "Fig house",
    siteName: "Hillside nursery",
    quantity: "air.temperature",
    direction: "below",
    sensorId: null,
    lastValue: 15,
    worstValue: 14.5,
    windowMin: 21,
    windowMax: 27,
    sinceMs: NOW_MS - 40 * 60_000,
    raisedAtMs: NOW_MS - 30 * 60_000,
    acknowledgedAtMs: null,
    acknowledgedByName: null,
    acknowledgeNote: null,
    clearedAtMs: null,
    escalatedAtMs: null,
    summary: "Air too cold",
    ...overrides,
  };
}
