/**
 * Benchwarden's mapping of resolved SenML records onto stored readings (PRODUCT.md §4, MQTT ingest).
 */
import { QUANTITIES, type Quantity } from "../schemas/quantities.js";
import {
  parseSenmlJsonIndexed,
  type PackRejectionReason,
  type RecordRejectionReason,
  type ResolvedRecord,
} from "./senml.js";
import { calibrate, type SensorCalibration } from "./calibration.js";
import { ACCEPTED_SENML_UNITS, toStoredValue } from "./units.js";

/** One value of one quantity at one time, in stored units (°C, %RH, ratio 0–1, %EL). */
export interface SensorReading {
  quantity: Quantity;
  value: number;
  /** Milliseconds since 1970-01-01 UTC, a whole number (readings are de-duplicated on it). */
  timeMs: number;
}

export type ReadingRejectionReason =
  | RecordRejectionReason
  | PackRejectionReason
  | "unknown-quantity"
  | "unit-not-accepted"
  | "out-of-range"
  | "time-too-old";

/** Why one record of a pack gave no reading; `index` is its position in the pack (0-based). */
export interface ReadingRejection {
  index: number;
  reason: ReadingRejectionReason;
  detail: string;
}

export type ReadingsFromPackResult =
  | { ok: true; readings: SensorReading[]; rejected: ReadingRejection[] }
  | { ok: false; reason: PackRejectionReason; detail: string };

/**
 * The probes' physical range per quantity, in stored units; a value outside it is a fault, not a
 * reading. Limits inclusive. Temperatures: the −40…85 °C industrial range of probe electronics
 * (common practice); RH 0…100 %; moisture 0…1 m³/m³; battery 0…100 %EL.
 */
export const PROBE_RANGE: Record<Quantity, { min: number; max: number }> = {
  "air.temperature": { min: -40, max: 85 },
  "air.humidity": { min: 0, max: 100 },
  "medium.temperature": { min: -40, max: 85 },
  "medium.moisture": { min: 0, max: 1 },
  battery: { min: 0, max: 100 },
};

export const DEFAULT_MAX_FUTURE_MS = 300_000;
export const DEFAULT_MAX_AGE_MS = 7 * 24 * 3600 * 1000;

// Longest first, so a name is matched to the most specific quantity.
const QUANTITIES_LONGEST_FIRST = [...QUANTITIES].sort((a, b) => b.length - a.length);

/**
 * The quantity a resolved record name stands for: the name itself, or a name ending in
 * ":" / "/" / "." followed by a quantity name (e.g. "urn:dev:bw-x:air.temperature").
 * Case-sensitive. Undefined when none matches.
 */
export function quantityFromRecordName(name: string): Quantity | undefined {
  for (const quantity of QUANTITIES_LONGEST_FIRST) {
    if (name === quantity) return quantity;
    if (name.endsWith(quantity)) {
      const separator = name.charAt(name.length - quantity.length - 1);
      if (separator === ":" || separator === "/" || separator === ".") return quantity;
    }
  }
  return undefined;
}

/**
 * One resolved record → a reading, or the reason it is not one. `nowMs` is the receiver's clock;
 * times older than `nowMs − maxAgeMs` are refused (future times were already checked by the resolver).
 */
export function readingFromRecord(
  record: ResolvedRecord,
  options: { nowMs: number; maxAgeMs?: number; calibration?: SensorCalibration },
): { ok: true; reading: SensorReading } | { ok: false; reason: ReadingRejectionReason; detail: string } {
  const quantity = quantityFromRecordName(record.name);
  if (quantity === undefined) {
    return { ok: false, reason: "unknown-quantity", detail: `no quantity is named by ${JSON.stringify(record.name)}` };
  }
  if (record.value === undefined) {
    if (record.stringValue !== undefined || record.booleanValue !== undefined || record.dataValue !== undefined) {
      return { ok: false, reason: "wrong-value-type", detail: `${quantity} needs a number (v)` };
    }
    return { ok: false, reason: "missing-value", detail: `${quantity} needs a value (v); a sum alone is not a reading` };
  }
  const value = toStoredValue(quantity, record.value, record.unit);
  if (value === undefined) {
    return {
      ok: false,
      reason: "unit-not-accepted",
      detail: `${quantity} takes ${ACCEPTED_SENML_UNITS[quantity].map((u) => JSON.stringify(u)).join(" or ")}, got ${
        record.unit === undefined ? "no unit" : JSON.stringify(record.unit)
      }`,
    };
  }
  const range = PROBE_RANGE[quantity];
  if (!(value >= range.min && value <= range.max)) {
    return { ok: false, reason: "out-of-range", detail: `${quantity} ${value} is outside the probe range ${range.min}…${range.max}` };
  }
  const timeMs = Math.round(record.timeS * 1000);
  const maxAgeMs = options.maxAgeMs ?? DEFAULT_MAX_AGE_MS;
  if (timeMs < options.nowMs - maxAgeMs) {
    return { ok: false, reason: "time-too-old", detail: `time ${timeMs} ms is ${options.nowMs - timeMs} ms before now (at most ${maxAgeMs} ms)` };
  }
  // The range check above is on what the probe measured (outside it the probe is faulty); the
  // correction may then carry a value just past a physical limit (RH 99 + 2), which is held at it.
  const calibrated = Math.min(range.max, Math.max(range.min, calibrate(quantity, value, options.calibration)));
  return { ok: true, reading: { quantity, value: calibrated, timeMs } };
}

/**
 * Text payload of one MQTT message → readings (PRODUCT.md §4).
 *
 * `nowMs` is the receiver's clock (ms since 1970); relative SenML times resolve against it.
 * Records more than `maxFutureMs` (default 300 s) ahead or `maxAgeMs` (default 7 days) behind
 * are refused; payloads over `maxBytes` (default 64 KiB) are refused whole. Units: temperatures
 * Cel or K (K converted), air.humidity %RH, medium.moisture "/", battery %EL; a missing unit is
 * "unit-not-accepted". Values outside PROBE_RANGE are "out-of-range". `calibration` (the sensor's
 * offset and gain) is applied to each value in stored units, after the range check. Readings come in time
 * order; rejections carry the record's index in the pack. Never throws.
 */
export function readingsFromPayload(
  text: string,
  options: { nowMs: number; maxFutureMs?: number; maxAgeMs?: number; maxBytes?: number; calibration?: SensorCalibration },
): ReadingsFromPackResult {
  const resolved = parseSenmlJsonIndexed(text, {
    nowS: options.nowMs / 1000,
    maxFutureS: (options.maxFutureMs ?? DEFAULT_MAX_FUTURE_MS) / 1000,
    ...(options.maxBytes !== undefined ? { maxBytes: options.maxBytes } : {}),
  });
  if (!resolved.ok) return resolved;

  const readings: SensorReading[] = [];
  const rejected: ReadingRejection[] = [...resolved.rejected];
  const readingOptions = {
    nowMs: options.nowMs,
    ...(options.maxAgeMs !== undefined ? { maxAgeMs: options.maxAgeMs } : {}),
    ...(options.calibration !== undefined ? { calibration: options.calibration } : {}),
  };
  for (const { index, record } of resolved.records) {
    const outcome = readingFromRecord(record, readingOptions);
    if (outcome.ok) readings.push(outcome.reading);
    else rejected.push({ index, reason: outcome.reason, detail: outcome.detail });
  }
  rejected.sort((a, b) => a.index - b.index);
  return { ok: true, readings, rejected };
}
