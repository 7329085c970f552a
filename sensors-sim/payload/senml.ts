import { QUANTITIES, STORED_UNIT, type Quantity } from "../../shared/schemas/quantities.js";

/**
 * The SenML (RFC 8428, JSON) packs a Benchwarden probe publishes (PRODUCT.md §4), and the
 * topics it publishes them on.
 */

/** The SenML record fields this simulator writes (RFC 8428 §4.1–4.2). */
export interface SenmlRecord {
  bn?: string;
  bt?: number;
  bu?: string;
  bver?: number;
  n?: string;
  u?: string;
  v?: number;
  vs?: string;
  vb?: boolean;
  t?: number;
}
export type SenmlPack = SenmlRecord[];

/** One sample of one probe: when it was taken (ms since 1970) and what it measured (SI). */
export interface TimedSample {
  timeMs: number;
  values: Partial<Record<Quantity, number>>;
}

export const TOPIC_PREFIX = "benchwarden/v1/sensors";

export function readingsTopic(sensorId: string): string {
  return `${TOPIC_PREFIX}/${sensorId}/readings`;
}

export function statusTopic(sensorId: string): string {
  return `${TOPIC_PREFIX}/${sensorId}/status`;
}

/** The last-will payload (PRODUCT.md §4). */
export const OFFLINE_PAYLOAD = "offline";

/** A probe's base name: record names resolve to `urn:dev:bw:<id>:air.temperature` and so on. */
export function baseName(sensorId: string): string {
  return `urn:dev:bw:${sensorId}:`;
}

/** Seconds since 1970 with millisecond resolution, as SenML times are written. */
export function senmlTime(timeMs: number): number {
  return Math.round(timeMs) / 1000;
}

/**
 * Build the pack for one or more samples of one probe, oldest first. The first record carries
 * the base name and, as base time, the newest sample's time; older samples carry a negative
 * relative `t` (RFC 8428 §4.5.3: resolved time = bt + t). Battery goes once, with the newest
 * sample. Quantities follow the order of QUANTITIES; missing ones are left out.
 */
export function buildReadingPack(sensorId: string, samples: readonly TimedSample[]): SenmlPack {
  if (samples.length === 0) throw new RangeError("a pack needs at least one sample");
  const newest = samples[samples.length - 1] as TimedSample;
  const bt = senmlTime(newest.timeMs);
  const pack: SenmlPack = [];
  samples.forEach((sample, i) => {
    const isNewest = i === samples.length - 1;
    const t = isNewest ? 0 : Math.round(senmlTime(sample.timeMs) * 1000 - bt * 1000) / 1000;
    for (const quantity of QUANTITIES) {
      if (quantity === "battery" && !isNewest) continue;
      const v = sample.values[quantity];
      if (v === undefined) continue;
      if (!Number.isFinite(v)) throw new RangeError(`${quantity} is not a finite number: ${v}`);
      const record: SenmlRecord = pack.length === 0 ? { bn: baseName(sensorId), bt } : {};
      record.n = quantity;
      record.u = STORED_UNIT[quantity];
      record.v = v;
      if (t !== 0) record.t = t;
      pack.push(record);
    }
  });
  if (pack.length === 0) throw new RangeError("the samples hold no values");
  return pack;
}

export function encodePack(pack: SenmlPack): string {
  return JSON.stringify(pack);
}
