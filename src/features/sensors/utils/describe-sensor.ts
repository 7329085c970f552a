import type { SensorKind } from "../../../../shared/schemas/quantities.js";
import type { SensorView } from "../../../../shared/schemas/sensors.js";
import { formatAge, isStale } from "../../../lib/format-time";

/** Benches to choose from, grouped by zone (the route fills this from GET /api/zones). */
export type BenchChoices = { zoneName: string; benches: { id: number; name: string }[] }[];

export const SENSOR_KIND_LABELS: Record<SensorKind, string> = {
  air: "Air probe",
  medium: "Medium probe",
  combined: "Air + medium probe",
};

export const SENSOR_KIND_DESCRIPTIONS: Record<SensorKind, string> = {
  air: "Air temperature and humidity",
  medium: "Temperature and moisture in the pot",
  combined: "Both, in one device",
};

/** Below this the battery is called out (common practice for coin-cell probes: change it soon). */
export const LOW_BATTERY_PCT = 20;

export function describeBench(sensor: Pick<SensorView, "benchName" | "zoneName">): string {
  if (!sensor.benchName) return "Not on a bench";
  return sensor.zoneName ? `${sensor.zoneName} · ${sensor.benchName}` : sensor.benchName;
}

export type SensorState = "disabled" | "never" | "reporting" | "quiet";

export function sensorState(sensor: Pick<SensorView, "disabled" | "lastSeenMs">, nowMs: number): SensorState {
  if (sensor.disabled) return "disabled";
  if (sensor.lastSeenMs === null) return "never";
  return isStale(sensor.lastSeenMs, nowMs) ? "quiet" : "reporting";
}

export const SENSOR_STATE_LABELS: Record<SensorState, string> = {
  disabled: "Disabled",
  never: "No readings yet",
  reporting: "Reporting",
  quiet: "Quiet",
};

export function describeLastSeen(lastSeenMs: number | null, nowMs: number): string {
  return lastSeenMs === null ? "Never" : formatAge(lastSeenMs, nowMs);
}

export function describeBattery(batteryPct: number | null): string {
  if (batteryPct === null) return "Not reported";
  const text = `${Math.round(batteryPct)} %`;
  return batteryPct < LOW_BATTERY_PCT ? `${text}, low` : text;
}

/** The MQTT topic the probe publishes its readings to (PRODUCT.md §4). */
export function readingsTopic(sensorId: string): string {
  return `benchwarden/v1/sensors/${sensorId}/readings`;
}
