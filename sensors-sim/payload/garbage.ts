import type { Rng } from "../model/random.js";
import { baseName, buildReadingPack, encodePack, readingsTopic, senmlTime, type TimedSample } from "./senml.js";

/**
 * Bad payloads for the bad-input tests (PRODUCT.md §4, "Bad readings"). The garbage scenario
 * sends them in turn, in this order, in place of every other pack; a test can also build any
 * one of them directly with `garbagePayload`.
 */
export const GARBAGE_KINDS = [
  "not-json",
  "not-a-pack",
  "empty-pack",
  "unknown-unit",
  "nan-value",
  "string-value",
  "out-of-range",
  "future-time",
  "unknown-quantity",
  "bad-name",
  "mandatory-label",
  "bver-too-high",
  "mixed-pack",
  "binary",
  "oversized",
  "wrong-topic",
] as const;
export type GarbageKind = (typeof GARBAGE_KINDS)[number];

/** What the server is expected to do with it. */
export type GarbageExpectation =
  /** Refuse the whole pack (it cannot be read, or RFC 8428 says refuse it). */
  | "reject-pack"
  /** Refuse the bad record(s), store the good ones of the same pack. */
  | "reject-record"
  /** Refuse the publish itself: not this sensor's topic. */
  | "refuse-publish";

export interface GarbagePayload {
  kind: GarbageKind;
  topic: string;
  payload: string | Buffer;
  expect: GarbageExpectation;
  /** What is wrong, for logs and test names. */
  note: string;
}

export interface GarbageContext {
  sensorId: string;
  /** When the sample was taken, ms since 1970. */
  timeMs: number;
  /** What the probe measured (used to make the bad pack look like its neighbours). */
  values: TimedSample["values"];
  rng: Rng;
}

/** Size of the oversized pack: larger than any sane probe packet (the server sets its own limit). */
export const OVERSIZED_BYTES = 300_000;

function goodPack(ctx: GarbageContext): string {
  return encodePack(buildReadingPack(ctx.sensorId, [{ timeMs: ctx.timeMs, values: ctx.values }]));
}

/** Build one bad payload of the given kind. Deterministic given the context's generator. */
export function garbagePayload(kind: GarbageKind, ctx: GarbageContext): GarbagePayload {
  const topic = readingsTopic(ctx.sensorId);
  const bn = baseName(ctx.sensorId);
  const bt = senmlTime(ctx.timeMs);
  const make = (payload: string | Buffer, expect: GarbageExpectation, note: string, to = topic): GarbagePayload => ({
    kind,
    topic: to,
    payload,
    expect,
    note,
  });
  switch (kind) {
    case "not-json": {
      const good = goodPack(ctx);
      return make(good.slice(0, Math.max(1, Math.floor(good.length * ctx.rng.uniform(0.3, 0.8)))), "reject-pack", "truncated JSON");
    }
    case "not-a-pack":
      return make(JSON.stringify({ bn, bt, n: "air.temperature", u: "Cel", v: 22.4 }), "reject-pack", "a JSON object, not an array of records");
    case "empty-pack":
      return make("[]", "reject-pack", "a pack with no records");
    case "unknown-unit":
      return make(
        JSON.stringify([{ bn, bt, n: "air.temperature", u: "degF", v: 72.5 }]),
        "reject-record",
        'unit "degF" is not a SenML unit',
      );
    case "nan-value":
      // What firmware printing a failed read with printf("%f") sends: not JSON at all.
      return make(`[{"bn":"${bn}","bt":${bt},"n":"air.temperature","u":"Cel","v":nan}]`, "reject-pack", "v is nan (invalid JSON)");
    case "string-value":
      return make(
        JSON.stringify([{ bn, bt, n: "air.humidity", u: "%RH", v: "NaN" }]),
        "reject-record",
        'v is the string "NaN"',
      );
    case "out-of-range":
      return make(
        JSON.stringify([
          { bn, bt, n: "air.temperature", u: "Cel", v: 412.5 },
          { n: "air.humidity", u: "%RH", v: 140 },
          { n: "medium.moisture", u: "/", v: 1.7 },
        ]),
        "reject-record",
        "values outside any probe's physical range",
      );
    case "future-time":
      return make(
        JSON.stringify([{ bn, bt: bt + 10 * 86_400, n: "air.temperature", u: "Cel", v: 22.4 }]),
        "reject-record",
        "time 10 days in the future",
      );
    case "unknown-quantity":
      return make(JSON.stringify([{ bn, bt, n: "leaf.wetness", u: "/", v: 0.2 }]), "reject-record", 'unknown record name "leaf.wetness"');
    case "bad-name":
      return make(
        JSON.stringify([{ bn: "urn:dev:bw: bad name!", bt, n: "air temperature", u: "Cel", v: 22.4 }]),
        "reject-pack",
        "name with characters RFC 8428 §4.5.1 does not allow",
      );
    case "mandatory-label":
      return make(
        JSON.stringify([{ bn, bt, n: "air.temperature", u: "Cel", v: 22.4, bw_calibrated_: true }]),
        "reject-pack",
        'unknown mandatory-to-understand label "bw_calibrated_" (RFC 8428 §4.4)',
      );
    case "bver-too-high":
      return make(JSON.stringify([{ bn, bt, bver: 99, n: "air.temperature", u: "Cel", v: 22.4 }]), "reject-pack", "bver 99");
    case "mixed-pack":
      return make(
        JSON.stringify([
          { bn, bt, n: "air.temperature", u: "Cel", v: ctx.values["air.temperature"] ?? 22.4 },
          { n: "air.humidity", u: "%RH", v: -5 },
          { n: "battery", u: "%EL", v: ctx.values.battery ?? 90 },
        ]),
        "reject-record",
        "good air.temperature and battery, bad air.humidity (-5 %RH)",
      );
    case "binary": {
      const bytes = Buffer.alloc(64);
      for (let i = 0; i < bytes.length; i += 1) bytes[i] = ctx.rng.int(256);
      bytes[0] = 0xff; // never valid UTF-8 as a first byte
      return make(bytes, "reject-pack", "64 random bytes");
    }
    case "oversized": {
      const record = `{"n":"air.temperature","u":"Cel","t":-1,"v":22.4}`;
      const head = `[{"bn":"${bn}","bt":${bt},"n":"air.temperature","u":"Cel","v":22.4}`;
      const count = Math.ceil((OVERSIZED_BYTES - head.length) / (record.length + 1));
      return make(`${head},${Array.from({ length: count }, () => record).join(",")}]`, "reject-pack", `a ${OVERSIZED_BYTES}-byte pack`);
    }
    case "wrong-topic":
      return make(goodPack(ctx), "refuse-publish", "published on another sensor's topic", readingsTopic(`${ctx.sensorId}-not-me`));
  }
}
