/**
 * Generic SenML (IETF RFC 8428, JSON representation) record resolution.
 *
 * Knows nothing about Benchwarden's quantities: it turns a pack into resolved records (§4.6) and
 * names a reason for every record it cannot resolve. `sensor-readings.ts` maps resolved records
 * onto stored readings.
 */

/** A record after §4.6 resolution: no base fields, absolute time in seconds since 1970 (UTC). */
export interface ResolvedRecord {
  /** Base name + name (§4.5.1). */
  name: string;
  /** Unit, else the base unit; absent when neither is given. */
  unit?: string;
  /** Numeric value: base value + value (§4.5.4). */
  value?: number;
  stringValue?: string;
  booleanValue?: boolean;
  /** Base64url data value, passed through as sent. */
  dataValue?: string;
  /** Base sum + sum. */
  sum?: number;
  /** Seconds since 1970-01-01 UTC; relative times are resolved against the receiver's clock. */
  timeS: number;
  /** Update time in seconds (a duration, not resolved against the base time). */
  updateTimeS?: number;
  /** The pack's base version, present only when the pack states one (§4.6 keeps bver in resolved records). */
  version?: number;
}

export type RecordRejectionReason =
  | "invalid-record"
  | "invalid-name"
  | "missing-value"
  | "non-finite"
  | "wrong-value-type"
  | "time-in-future";

/** Why one record of a pack was not resolved; `index` is its position in the pack (0-based). */
export interface RecordRejection {
  index: number;
  reason: RecordRejectionReason;
  detail: string;
}

export type PackRejectionReason = "malformed-json" | "not-a-pack" | "unsupported-version" | "unknown-mandatory-field";

export type ResolvePackResult =
  | { ok: true; records: ResolvedRecord[]; rejected: RecordRejection[] }
  | { ok: false; reason: PackRejectionReason; detail: string };

/** A resolved record with its position in the pack (records are re-ordered by time, §4.6). */
export interface IndexedResolvedRecord {
  index: number;
  record: ResolvedRecord;
}

export type ResolveIndexedPackResult =
  | { ok: true; records: IndexedResolvedRecord[]; rejected: RecordRejection[] }
  | { ok: false; reason: PackRejectionReason; detail: string };

/** Resolved times below 2**28 s are relative to the receiver's "now" (RFC 8428 §4.5.3). */
export const SENML_RELATIVE_TIME_LIMIT_S = 2 ** 28;
/** The version this resolver understands (RFC 8428 §4.4: bver defaults to 10). */
export const SENML_VERSION = 10;
export const DEFAULT_MAX_FUTURE_S = 300;
export const DEFAULT_MAX_PACK_BYTES = 64 * 1024;

const NAME_PATTERN = /^[A-Za-z0-9][A-Za-z0-9\-:./_]*$/;

/** The labels RFC 8428 §4.1 defines, with the JSON type each must have. */
const LABEL_TYPES = {
  bn: "string",
  bt: "number",
  bu: "string",
  bv: "number",
  bs: "number",
  bver: "number",
  n: "string",
  u: "string",
  v: "number",
  vs: "string",
  vb: "boolean",
  vd: "string",
  s: "number",
  t: "number",
  ut: "number",
} as const;
type Label = keyof typeof LABEL_TYPES;
const BASE_LABELS = ["bn", "bt", "bu", "bv", "bs"] as const;
type BaseLabel = (typeof BASE_LABELS)[number];
const VALUE_LABELS = ["v", "vs", "vb", "vd"] as const;

/** A base field in force: its value, or the record that set it invalidly (later records that need it are rejected). */
type BaseSlot<T> = { ok: true; value: T | undefined } | { ok: false; index: number; detail: string };

interface BaseState {
  bn: BaseSlot<string>;
  bt: BaseSlot<number>;
  bu: BaseSlot<string>;
  bv: BaseSlot<number>;
  bs: BaseSlot<number>;
}

function hasOwn(object: object, key: string): boolean {
  return Object.prototype.hasOwnProperty.call(object, key);
}

function isPlainObject(value: unknown): value is Record<string, unknown> {
  return typeof value === "object" && value !== null && !Array.isArray(value);
}

function typeName(value: unknown): string {
  if (value === null) return "null";
  if (Array.isArray(value)) return "array";
  return typeof value;
}

/** Checks one field's type; numbers must also be finite (JSON cannot carry NaN, but a caller's object can). */
function checkField(label: Label, value: unknown): { ok: true } | { ok: false; reason: RecordRejectionReason; detail: string } {
  const expected = LABEL_TYPES[label];
  if (typeof value !== expected) {
    const isValueField = label === "v" || label === "vs" || label === "vb" || label === "vd" || label === "s";
    return {
      ok: false,
      reason: isValueField ? "wrong-value-type" : "invalid-record",
      detail: `"${label}" must be a ${expected}, got ${typeName(value)}`,
    };
  }
  if (expected === "number" && !Number.isFinite(value)) {
    return { ok: false, reason: "non-finite", detail: `"${label}" is not a finite number` };
  }
  return { ok: true };
}

/**
 * Resolves a SenML pack (an already-parsed JSON value) record by record, per RFC 8428 §4.5–4.6.
 *
 * - A base field (bn, bt, bu, bv, bs) applies to its own record and every later one until
 *   replaced. name = bn + n; time = bt + t (missing counts as 0); unit = u, else bu;
 *   value = bv + v; sum = bs + s.
 * - A resolved time below 2**28 is relative: it resolves to `nowS` + time. `nowS` is the
 *   receiver's clock in seconds since 1970 (fractions allowed).
 * - Records that carry only base fields yield nothing (RFC 8428 §5.1.7 example).
 * - The resolved records are returned in chronological order (stable), as §4.6 requires.
 *
 * Whole-pack refusals: not an array of records, empty, bver above 10 or not a positive integer,
 * records disagreeing on bver, any label ending in "_" (mandatory to understand, §4.4).
 * Per-record refusals (the rest of the pack is kept): not an object, field of the wrong type,
 * several value fields, no value and no sum, invalid resolved name (§4.5.1), non-finite result,
 * resolved time more than `maxFutureS` (default 300 s) after `nowS`, or a base field it relies on
 * that was invalid. Unknown labels are ignored (§4.4). Never throws.
 */
export function resolveSenmlPack(pack: unknown, options: { nowS: number; maxFutureS?: number }): ResolvePackResult {
  const result = resolveSenmlPackIndexed(pack, options);
  if (!result.ok) return result;
  return { ok: true, records: result.records.map((r) => r.record), rejected: result.rejected };
}

/** As {@link resolveSenmlPack}, but each resolved record keeps its index in the pack. */
export function resolveSenmlPackIndexed(
  pack: unknown,
  options: { nowS: number; maxFutureS?: number },
): ResolveIndexedPackResult {
  if (!Array.isArray(pack)) return { ok: false, reason: "not-a-pack", detail: `a SenML pack is a JSON array, got ${typeName(pack)}` };
  if (pack.length === 0) return { ok: false, reason: "not-a-pack", detail: "the pack holds no records" };

  // Pack-level checks first: they refuse the whole pack, so nothing is resolved before them.
  let version: number | undefined;
  for (let index = 0; index < pack.length; index++) {
    const entry: unknown = pack[index];
    if (!isPlainObject(entry)) continue;
    for (const key of Object.keys(entry)) {
      if (key.endsWith("_")) {
        return { ok: false, reason: "unknown-mandatory-field", detail: `record ${index}: label "${key}" must be understood and is not` };
      }
    }
    if (hasOwn(entry, "bver")) {
      const bver = entry.bver;
      if (typeof bver !== "number" || !Number.isInteger(bver) || bver < 1) {
        return { ok: false, reason: "unsupported-version", detail: `record ${index}: "bver" must be a positive integer` };
      }
      if (bver > SENML_VERSION) {
        return { ok: false, reason: "unsupported-version", detail: `record ${index}: version ${bver} is newer than ${SENML_VERSION}` };
      }
      if (version !== undefined && version !== bver) {
        return { ok: false, reason: "unsupported-version", detail: `record ${index}: records disagree on the version (${version}, ${bver})` };
      }
      version = bver;
    }
  }

  const maxFutureS = options.maxFutureS ?? DEFAULT_MAX_FUTURE_S;
  const base: BaseState = {
    bn: { ok: true, value: undefined },
    bt: { ok: true, value: undefined },
    bu: { ok: true, value: undefined },
    bv: { ok: true, value: undefined },
    bs: { ok: true, value: undefined },
  };
  const records: IndexedResolvedRecord[] = [];
  const rejected: RecordRejection[] = [];

  for (let index = 0; index < pack.length; index++) {
    const entry: unknown = pack[index];
    if (!isPlainObject(entry)) {
      rejected.push({ index, reason: "invalid-record", detail: `a record is a JSON object, got ${typeName(entry)}` });
      continue;
    }
    // Base fields first: they apply to this record too, even when the record is rejected.
    for (const label of BASE_LABELS) {
      if (!hasOwn(entry, label)) continue;
      const check = checkField(label, entry[label]);
      setBase(base, label, check.ok ? { ok: true, value: entry[label] } : { ok: false, index, detail: check.detail });
    }
    const outcome = resolveRecord(entry, base, options.nowS);
    if (outcome === null) continue; // only base fields
    if (!outcome.ok) {
      rejected.push({ index, reason: outcome.reason, detail: outcome.detail });
      continue;
    }
    const record = outcome.record;
    if (record.timeS > options.nowS + maxFutureS) {
      rejected.push({
        index,
        reason: "time-in-future",
        detail: `time ${record.timeS} s is ${record.timeS - options.nowS} s ahead of now (at most ${maxFutureS} s)`,
      });
      continue;
    }
    if (version !== undefined) record.version = version;
    records.push({ index, record });
  }

  // §4.6: resolved records are in chronological order. Array.prototype.sort is stable.
  records.sort((a, b) => a.record.timeS - b.record.timeS);
  return { ok: true, records, rejected };
}

function setBase(base: BaseState, label: BaseLabel, slot: BaseSlot<unknown>): void {
  // The slot's type was checked by checkField against LABEL_TYPES.
  (base as unknown as Record<BaseLabel, BaseSlot<unknown>>)[label] = slot;
}

type RecordOutcome =
  | { ok: true; record: ResolvedRecord }
  | { ok: false; reason: RecordRejectionReason; detail: string }
  | null;

function baseValue<T>(slot: BaseSlot<T>, label: BaseLabel): { ok: true; value: T | undefined } | { ok: false; detail: string } {
  if (slot.ok) return slot;
  return { ok: false, detail: `relies on "${label}" of record ${slot.index}, which is invalid: ${slot.detail}` };
}

function resolveRecord(entry: Record<string, unknown>, base: BaseState, nowS: number): RecordOutcome {
  const regular = (["n", "u", "v", "vs", "vb", "vd", "s", "t", "ut"] as const).filter((label) => hasOwn(entry, label));
  if (regular.length === 0) return null;

  for (const label of regular) {
    const check = checkField(label, entry[label]);
    if (!check.ok) return check;
  }
  const valueLabels = VALUE_LABELS.filter((label) => hasOwn(entry, label));
  if (valueLabels.length > 1) {
    return { ok: false, reason: "invalid-record", detail: `a record carries one value field, got ${valueLabels.join(", ")}` };
  }
  if (valueLabels.length === 0 && !hasOwn(entry, "s")) {
    return { ok: false, reason: "missing-value", detail: "the record has no value (v, vs, vb, vd) and no sum (s)" };
  }

  const bn = baseValue(base.bn, "bn");
  if (!bn.ok) return { ok: false, reason: "invalid-record", detail: bn.detail };
  const name = (bn.value ?? "") + ((entry.n as string | undefined) ?? "");
  if (!NAME_PATTERN.test(name)) {
    return {
      ok: false,
      reason: "invalid-name",
      detail: name === "" ? "the resolved name is empty" : `the resolved name ${JSON.stringify(name)} breaks RFC 8428 §4.5.1`,
    };
  }

  const bt = baseValue(base.bt, "bt");
  if (!bt.ok) return { ok: false, reason: "invalid-record", detail: bt.detail };
  let timeS = (bt.value ?? 0) + ((entry.t as number | undefined) ?? 0);
  if (timeS < SENML_RELATIVE_TIME_LIMIT_S) timeS = nowS + timeS;
  if (!Number.isFinite(timeS)) return { ok: false, reason: "non-finite", detail: "the resolved time is not finite" };

  const record: ResolvedRecord = { name, timeS };

  if (hasOwn(entry, "u")) {
    record.unit = entry.u as string;
  } else {
    const bu = baseValue(base.bu, "bu");
    if (!bu.ok) return { ok: false, reason: "invalid-record", detail: bu.detail };
    if (bu.value !== undefined) record.unit = bu.value;
  }

  if (hasOwn(entry, "v")) {
    const bv = baseValue(base.bv, "bv");
    if (!bv.ok) return { ok: false, reason: "invalid-record", detail: bv.detail };
    const value = (bv.value ?? 0) + (entry.v as number);
    if (!Number.isFinite(value)) return { ok: false, reason: "non-finite", detail: "base value + value is not finite" };
    record.value = value;
  }
  if (hasOwn(entry, "vs")) record.stringValue = entry.vs as string;
  if (hasOwn(entry, "vb")) record.booleanValue = entry.vb as boolean;
  if (hasOwn(entry, "vd")) record.dataValue = entry.vd as string;

  if (hasOwn(entry, "s")) {
    const bs = baseValue(base.bs, "bs");
    if (!bs.ok) return { ok: false, reason: "invalid-record", detail: bs.detail };
    const sum = (bs.value ?? 0) + (entry.s as number);
    if (!Number.isFinite(sum)) return { ok: false, reason: "non-finite", detail: "base sum + sum is not finite" };
    record.sum = sum;
  }
  if (hasOwn(entry, "ut")) record.updateTimeS = entry.ut as number;

  return { ok: true, record };
}

/**
 * UTF-8 length of a string in bytes, without TextEncoder (keeps this module free of platform APIs).
 * A lone surrogate counts 3 bytes, as U+FFFD would.
 */
export function utf8ByteLength(text: string): number {
  let bytes = 0;
  for (let i = 0; i < text.length; i++) {
    const code = text.charCodeAt(i);
    if (code < 0x80) bytes += 1;
    else if (code < 0x800) bytes += 2;
    else if (code >= 0xd800 && code <= 0xdbff && i + 1 < text.length) {
      const next = text.charCodeAt(i + 1);
      if (next >= 0xdc00 && next <= 0xdfff) {
        bytes += 4;
        i++;
      } else bytes += 3;
    } else bytes += 3;
  }
  return bytes;
}

/**
 * SenML JSON text → {@link resolveSenmlPack}. Never throws.
 * Text longer than `maxBytes` UTF-8 bytes (default 64 KiB) is refused as "not-a-pack" before parsing;
 * text that is not JSON is refused as "malformed-json". `nowS` and `maxFutureS` as for resolveSenmlPack.
 */
export function parseSenmlJson(
  text: string,
  options: { nowS: number; maxFutureS?: number; maxBytes?: number },
): ResolvePackResult {
  const result = parseSenmlJsonIndexed(text, options);
  if (!result.ok) return result;
  return { ok: true, records: result.records.map((r) => r.record), rejected: result.rejected };
}

/** As {@link parseSenmlJson}, but each resolved record keeps its index in the pack. */
export function parseSenmlJsonIndexed(
  text: string,
  options: { nowS: number; maxFutureS?: number; maxBytes?: number },
): ResolveIndexedPackResult {
  const maxBytes = options.maxBytes ?? DEFAULT_MAX_PACK_BYTES;
  // Every UTF-16 code unit is at least one UTF-8 byte, so a long string is refused without counting.
  if (text.length > maxBytes || utf8ByteLength(text) > maxBytes) {
    return { ok: false, reason: "not-a-pack", detail: `the payload is larger than ${maxBytes} bytes` };
  }
  let pack: unknown;
  try {
    pack = JSON.parse(text);
  } catch (error) {
    return { ok: false, reason: "malformed-json", detail: error instanceof Error ? error.message : "not JSON" };
  }
  return resolveSenmlPackIndexed(pack, options);
}
