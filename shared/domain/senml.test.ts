import { describe, it, expect } from "vitest";
import fc from "fast-check";
import {
  parseSenmlJson,
  resolveSenmlPack,
  utf8ByteLength,
  SENML_RELATIVE_TIME_LIMIT_S,
  type ResolvedRecord,
} from "./senml.js";

// The RFC 8428 §5.1 examples, verbatim but for indentation (as copied in REFERENCES.md §5).
const RFC_5_1_1 = `[
  {"n":"urn:dev:ow:10e2073a01080063","u":"Cel","v":23.1}
]`;
const RFC_5_1_2_A = `[
  {"bn":"urn:dev:ow:10e2073a01080063:","n":"voltage","u":"V","v":120.1},
  {"n":"current","u":"A","v":1.2}
]`;
const RFC_5_1_2_B = `[
  {"bn":"urn:dev:ow:10e2073a0108006:","bt":1.276020076001e+09,
   "bu":"A","bver":5,
   "n":"voltage","u":"V","v":120.1},
  {"n":"current","t":-5,"v":1.2},
  {"n":"current","t":-4,"v":1.3},
  {"n":"current","t":-3,"v":1.4},
  {"n":"current","t":-2,"v":1.5},
  {"n":"current","t":-1,"v":1.6},
  {"n":"current","v":1.7}
]`;
const RFC_5_1_2_STREAM = `[
  {"bn":"urn:dev:ow:10e2073a01080063","bt":1.320067464e+09,
   "bu":"%RH","v":21.2},
  {"t":10,"v":21.3},
  {"t":20,"v":21.4},
  {"t":30,"v":21.4},
  {"t":40,"v":21.5},
  {"t":50,"v":21.5},
  {"t":60,"v":21.5},
  {"t":70,"v":21.6},
  {"t":80,"v":21.7},
...`;
const RFC_5_1_3 = `[
  {"bn":"urn:dev:ow:10e2073a01080063","bt":1.320067464e+09,
   "bu":"%RH","v":20},
  {"u":"lon","v":24.30621},
  {"u":"lat","v":60.07965},
  {"t":60,"v":20.3},
  {"u":"lon","t":60,"v":24.30622},
  {"u":"lat","t":60,"v":60.07965},
  {"t":120,"v":20.7},
  {"u":"lon","t":120,"v":24.30623},
  {"u":"lat","t":120,"v":60.07966},
  {"u":"%EL","t":150,"v":98},
  {"t":180,"v":21.2},
  {"u":"lon","t":180,"v":24.30628},
  {"u":"lat","t":180,"v":60.07967}
]`;
const RFC_5_1_4 = `[
  {"n":"urn:dev:ow:10e2073a01080063","u":"%RH","t":1.320067464e+09,
   "v":20},
  {"n":"urn:dev:ow:10e2073a01080063","u":"lon","t":1.320067464e+09,
   "v":24.30621},
  {"n":"urn:dev:ow:10e2073a01080063","u":"lat","t":1.320067464e+09,
   "v":60.07965},
  {"n":"urn:dev:ow:10e2073a01080063","u":"%RH","t":1.320067524e+09,
   "v":20.3},
  {"n":"urn:dev:ow:10e2073a01080063","u":"lon","t":1.320067524e+09,
   "v":24.30622},
  {"n":"urn:dev:ow:10e2073a01080063","u":"lat","t":1.320067524e+09,
   "v":60.07965},
  {"n":"urn:dev:ow:10e2073a01080063","u":"%RH","t":1.320067584e+09,
   "v":20.7},
  {"n":"urn:dev:ow:10e2073a01080063","u":"lon","t":1.320067584e+09,
   "v":24.30623},
  {"n":"urn:dev:ow:10e2073a01080063","u":"lat","t":1.320067584e+09,
   "v":60.07966},
  {"n":"urn:dev:ow:10e2073a01080063","u":"%EL","t":1.320067614e+09,
   "v":98},
  {"n":"urn:dev:ow:10e2073a01080063","u":"%RH","t":1.320067644e+09,
   "v":21.2},
  {"n":"urn:dev:ow:10e2073a01080063","u":"lon","t":1.320067644e+09,
   "v":24.30628},
  {"n":"urn:dev:ow:10e2073a01080063","u":"lat","t":1.320067644e+09,
   "v":60.07967}
]`;
const RFC_5_1_5 = `[
  {"bn":"urn:dev:ow:10e2073a01080063:","n":"temp","u":"Cel","v":23.1},
  {"n":"label","vs":"Machine Room"},
  {"n":"open","vb":false},
  {"n":"nfv-reader","vd":"aGkgCg"}
]`;
const RFC_5_1_6 = `[
  {"bn":"2001:db8::2/","bt":1.320078429e+09,
   "n":"temperature","u":"Cel","v":25.2},
  {"n":"humidity","u":"%RH","v":30},
  {"bn":"2001:db8::1/","n":"temperature","u":"Cel","v":12.3},
  {"n":"humidity","u":"%RH","v":67}
]`;
const RFC_5_1_7_A = `[
  {"bn":"urn:dev:ow:10e2073a01080063:"},
  {"n":"temp","u":"Cel","v":23.1},
  {"n":"heat","u":"/","v":1},
  {"n":"fan","u":"/","v":0}
]`;
const RFC_5_1_7_B = `[
  {"bt":1.320078429e+09,"bu":"/","n":"2001:db8::3","v":1},
  {"n":"2001:db8::4","v":1}
]`;
const RFC_5_1_7_C = `[
  {"bt":1.320078429e+09,"bu":"/","n":"2001:db8::3","v":0.5},
  {"n":"2001:db8::4","v":0.5},
  {"n":"2001:db8::3","t":0.1,"v":0},
  {"n":"2001:db8::4","t":0.1,"v":0}
]`;

/** The receiver's clock for these tests: 2023-11-14T22:13:20Z. */
const NOW_S = 1_700_000_000;

function resolveOk(text: string, nowS = NOW_S): ResolvedRecord[] {
  const result = parseSenmlJson(text, { nowS });
  if (!result.ok) throw new Error(`pack refused: ${result.reason} ${result.detail}`);
  expect(result.rejected).toEqual([]);
  return result.records;
}

/** Shapes a §5.1.4-style resolved JSON record as a ResolvedRecord. */
function fromRfcResolved(r: { n: string; u?: string; t: number; v: number }): ResolvedRecord {
  return { name: r.n, ...(r.u !== undefined ? { unit: r.u } : {}), value: r.v, timeS: r.t };
}

describe("resolveSenmlPack — the RFC 8428 §5.1 examples", () => {
  it("§5.1.1 single datapoint: name, unit and value as sent, time = now (RFC 8428 §5.1.1, §4.5.3)", () => {
    expect(resolveOk(RFC_5_1_1)).toEqual([{ name: "urn:dev:ow:10e2073a01080063", unit: "Cel", value: 23.1, timeS: NOW_S }]);
  });

  it("§5.1.2 (a) multiple datapoints: bn is prefixed to each n (RFC 8428 §5.1.2, §4.6)", () => {
    expect(resolveOk(RFC_5_1_2_A)).toEqual([
      { name: "urn:dev:ow:10e2073a01080063:voltage", unit: "V", value: 120.1, timeS: NOW_S },
      { name: "urn:dev:ow:10e2073a01080063:current", unit: "A", value: 1.2, timeS: NOW_S },
    ]);
  });

  it("§5.1.2 (b) relative t against bt, bu applies where u is absent, bver kept, chronological order (RFC 8428 §5.1.2 prose, §4.6)", () => {
    const records = resolveOk(RFC_5_1_2_B);
    const name = "urn:dev:ow:10e2073a0108006:";
    const expected = [
      { n: "current", u: "A", v: 1.2, t: 1276020071.001 },
      { n: "current", u: "A", v: 1.3, t: 1276020072.001 },
      { n: "current", u: "A", v: 1.4, t: 1276020073.001 },
      { n: "current", u: "A", v: 1.5, t: 1276020074.001 },
      { n: "current", u: "A", v: 1.6, t: 1276020075.001 },
      { n: "voltage", u: "V", v: 120.1, t: 1276020076.001 },
      { n: "current", u: "A", v: 1.7, t: 1276020076.001 },
    ];
    expect(records).toHaveLength(expected.length);
    records.forEach((record, i) => {
      const want = expected[i]!;
      expect(record.name).toBe(name + want.n);
      expect(record.unit).toBe(want.u);
      expect(record.value).toBe(want.v);
      expect(record.timeS).toBeCloseTo(want.t, 6);
      expect(record.version).toBe(5);
    });
  });

  it("§5.1.2 SenML stream as printed (truncated with …) is not valid JSON and is refused whole (RFC 8428 §5.1.2)", () => {
    const result = parseSenmlJson(RFC_5_1_2_STREAM, { nowS: NOW_S });
    expect(result.ok).toBe(false);
    if (!result.ok) expect(result.reason).toBe("malformed-json");
  });

  it("§5.1.3 resolves exactly to the RFC's own §5.1.4 resolved data (RFC 8428 §5.1.3–5.1.4)", () => {
    const rfcResolved = JSON.parse(RFC_5_1_4) as { n: string; u: string; t: number; v: number }[];
    expect(resolveOk(RFC_5_1_3)).toEqual(rfcResolved.map(fromRfcResolved));
  });

  it("§5.1.4 resolved data is a fixed point: resolving it again changes nothing (RFC 8428 §4.6)", () => {
    const rfcResolved = JSON.parse(RFC_5_1_4) as { n: string; u: string; t: number; v: number }[];
    expect(resolveOk(RFC_5_1_4)).toEqual(rfcResolved.map(fromRfcResolved));
  });

  it("§5.1.5 string, boolean and data values keep their own fields (RFC 8428 §5.1.5, §4.2)", () => {
    const bn = "urn:dev:ow:10e2073a01080063:";
    expect(resolveOk(RFC_5_1_5)).toEqual([
      { name: `${bn}temp`, unit: "Cel", value: 23.1, timeS: NOW_S },
      { name: `${bn}label`, stringValue: "Machine Room", timeS: NOW_S },
      { name: `${bn}open`, booleanValue: false, timeS: NOW_S },
      { name: `${bn}nfv-reader`, dataValue: "aGkgCg", timeS: NOW_S },
    ]);
  });

  it("§5.1.6 a second bn replaces the first, bt of record 1 still applies (RFC 8428 §5.1.6 prose)", () => {
    expect(resolveOk(RFC_5_1_6)).toEqual([
      { name: "2001:db8::2/temperature", unit: "Cel", value: 25.2, timeS: 1320078429 },
      { name: "2001:db8::2/humidity", unit: "%RH", value: 30, timeS: 1320078429 },
      { name: "2001:db8::1/temperature", unit: "Cel", value: 12.3, timeS: 1320078429 },
      { name: "2001:db8::1/humidity", unit: "%RH", value: 67, timeS: 1320078429 },
    ]);
  });

  it("§5.1.7 (a) a bn-only record yields nothing and is not an error (RFC 8428 §5.1.7, derived by §4.6)", () => {
    const bn = "urn:dev:ow:10e2073a01080063:";
    expect(resolveOk(RFC_5_1_7_A)).toEqual([
      { name: `${bn}temp`, unit: "Cel", value: 23.1, timeS: NOW_S },
      { name: `${bn}heat`, unit: "/", value: 1, timeS: NOW_S },
      { name: `${bn}fan`, unit: "/", value: 0, timeS: NOW_S },
    ]);
  });

  it("§5.1.7 (b) bu and bt apply to names without a bn (RFC 8428 §5.1.7, derived by §4.6)", () => {
    expect(resolveOk(RFC_5_1_7_B)).toEqual([
      { name: "2001:db8::3", unit: "/", value: 1, timeS: 1320078429 },
      { name: "2001:db8::4", unit: "/", value: 1, timeS: 1320078429 },
    ]);
  });

  it("§5.1.7 (c) fractional relative time added to bt (RFC 8428 §5.1.7, REFERENCES.md §5 resolution)", () => {
    const records = resolveOk(RFC_5_1_7_C);
    expect(records.map((r) => [r.name, r.unit, r.value])).toEqual([
      ["2001:db8::3", "/", 0.5],
      ["2001:db8::4", "/", 0.5],
      ["2001:db8::3", "/", 0],
      ["2001:db8::4", "/", 0],
    ]);
    expect(records.map((r) => r.timeS)).toEqual([1320078429, 1320078429, 1320078429.1, 1320078429.1]);
  });
});

describe("resolveSenmlPack — base fields and time (RFC 8428 §4.1, §4.5.3, §4.6)", () => {
  const nowS = NOW_S;

  it("bv is added to v and bs to s (RFC 8428 §4.1, §4.6)", () => {
    const result = resolveSenmlPack([{ bn: "bw-a:", bv: 20, bs: 100, n: "x", u: "Cel", v: 1.5, s: 2 }], { nowS });
    expect(result).toEqual({ ok: true, records: [{ name: "bw-a:x", unit: "Cel", value: 21.5, sum: 102, timeS: nowS }], rejected: [] });
  });

  it("a base field applies to later records until replaced (RFC 8428 §4.6)", () => {
    const result = resolveSenmlPack(
      [
        { bn: "a:", bu: "Cel", n: "x", v: 1 },
        { n: "y", v: 2 },
        { bn: "b:", bu: "%RH", n: "x", v: 3 },
        { n: "y", v: 4 },
      ],
      { nowS },
    );
    expect(result.ok && result.records.map((r) => `${r.name} ${r.unit} ${r.value}`)).toEqual(["a:x Cel 1", "a:y Cel 2", "b:x %RH 3", "b:y %RH 4"]);
  });

  it("a resolved time at 2**28 or above is absolute, below is relative to now (RFC 8428 §4.5.3)", () => {
    const result = resolveSenmlPack(
      [
        { n: "abs", v: 1, t: SENML_RELATIVE_TIME_LIMIT_S },
        { n: "rel", v: 1, t: -1 },
        { n: "just-below", v: 1, t: SENML_RELATIVE_TIME_LIMIT_S - 1 },
        { n: "neg", v: 1, t: -3600 },
      ],
      { nowS, maxFutureS: Number.MAX_VALUE },
    );
    if (!result.ok) throw new Error("refused");
    const byName = new Map(result.records.map((r) => [r.name, r.timeS]));
    expect(byName.get("abs")).toBe(SENML_RELATIVE_TIME_LIMIT_S);
    expect(byName.get("rel")).toBe(nowS - 1);
    expect(byName.get("neg")).toBe(nowS - 3600);
    expect(byName.get("just-below")).toBe(nowS + SENML_RELATIVE_TIME_LIMIT_S - 1);
  });

  it("the 2**28 rule applies to bt + t, not to each part (RFC 8428 §4.5.3: the sum is the time)", () => {
    const result = resolveSenmlPack([{ bt: 300_000_000, n: "x", v: 1, t: -100_000_000 }], { nowS });
    // 200,000,000 < 2**28 → relative: now + 2e8 s lies far in the future and is refused.
    expect(result.ok && result.rejected[0]?.reason).toBe("time-in-future");
  });

  it("a time more than maxFutureS ahead is refused; default 300 s (our choice; RFC 8428 §4.5.3 allows future times)", () => {
    const pack = [
      { n: "ok", v: 1, t: 300 },
      { n: "late", v: 1, t: 301 },
    ];
    const result = resolveSenmlPack(pack, { nowS });
    expect(result.ok && result.records.map((r) => r.name)).toEqual(["ok"]);
    expect(result.ok && result.rejected).toEqual([{ index: 1, reason: "time-in-future", detail: expect.any(String) }]);
    const wider = resolveSenmlPack(pack, { nowS, maxFutureS: 600 });
    expect(wider.ok && wider.records).toHaveLength(2);
  });

  it("ut is a duration and is passed through, not added to bt (RFC 8428 §4.5.3)", () => {
    const result = resolveSenmlPack([{ bt: 1.5e9, n: "x", v: 1, ut: 60 }], { nowS });
    expect(result.ok && result.records[0]).toEqual({ name: "x", value: 1, timeS: 1.5e9, updateTimeS: 60 });
  });

  it("resolved records are stably ordered by time (RFC 8428 §4.6)", () => {
    const result = resolveSenmlPack(
      [
        { n: "c", v: 1, t: -10 },
        { n: "a", v: 1, t: -30 },
        { n: "b", v: 1, t: -30 },
      ],
      { nowS },
    );
    expect(result.ok && result.records.map((r) => r.name)).toEqual(["a", "b", "c"]);
  });
});

describe("resolveSenmlPack — per-record rejections keep the rest of the pack (PRODUCT.md §4 bad readings)", () => {
  const nowS = NOW_S;
  const reasons = (pack: unknown[]) => {
    const result = resolveSenmlPack(pack, { nowS });
    if (!result.ok) throw new Error(`pack refused: ${result.reason}`);
    return { kept: result.records.map((r) => r.name), rejected: result.rejected.map((r) => [r.index, r.reason]) };
  };

  it("missing value and sum → missing-value (RFC 8428 §4.2)", () => {
    expect(reasons([{ n: "a", v: 1 }, { n: "b", u: "Cel" }])).toEqual({ kept: ["a"], rejected: [[1, "missing-value"]] });
  });

  it("a sum alone is a record (RFC 8428 §4.2)", () => {
    expect(reasons([{ n: "a", s: 5 }])).toEqual({ kept: ["a"], rejected: [] });
  });

  it("v as a string or boolean → wrong-value-type; vs as a number → wrong-value-type (RFC 8428 §4.2 field types)", () => {
    expect(reasons([{ n: "a", v: "23.1" }, { n: "b", v: true }, { n: "c", vs: 3 }, { n: "d", v: 1 }])).toEqual({
      kept: ["d"],
      rejected: [
        [0, "wrong-value-type"],
        [1, "wrong-value-type"],
        [2, "wrong-value-type"],
      ],
    });
  });

  it("two value fields in one record → invalid-record (RFC 8428 §4.2: one of v, vs, vb, vd)", () => {
    expect(reasons([{ n: "a", v: 1, vs: "x" }])).toEqual({ kept: [], rejected: [[0, "invalid-record"]] });
  });

  it("NaN or Infinity (possible in a caller's object, not in JSON) → non-finite", () => {
    expect(reasons([{ n: "a", v: Number.NaN }, { n: "b", v: Number.POSITIVE_INFINITY }, { n: "c", v: 1, t: Number.NaN }])).toEqual({
      kept: [],
      rejected: [
        [0, "non-finite"],
        [1, "non-finite"],
        [2, "non-finite"],
      ],
    });
  });

  it("base value + value overflowing to Infinity → non-finite", () => {
    expect(reasons([{ bv: Number.MAX_VALUE, n: "a", v: Number.MAX_VALUE }])).toEqual({ kept: [], rejected: [[0, "non-finite"]] });
  });

  it("names outside A–Z a–z 0–9 - : . / _ or not starting with a letter or digit → invalid-name (RFC 8428 §4.5.1)", () => {
    expect(
      reasons([
        { n: "ok-1:a.b/c_d", v: 1 },
        { n: "has space", v: 1 },
        { n: "-leading", v: 1 },
        { n: "", v: 1 },
        { v: 1 },
        { n: "température", v: 1 },
      ]),
    ).toEqual({
      kept: ["ok-1:a.b/c_d"],
      rejected: [
        [1, "invalid-name"],
        [2, "invalid-name"],
        [3, "invalid-name"],
        [4, "invalid-name"],
        [5, "invalid-name"],
      ],
    });
  });

  it("a record that is not an object or has a field of the wrong type → invalid-record", () => {
    expect(reasons([42, null, [1], { n: 5, v: 1 }, { n: "a", u: 1, v: 1 }, { n: "b", v: 1, t: "now" }, { n: "c", v: 1 }])).toEqual({
      kept: ["c"],
      rejected: [
        [0, "invalid-record"],
        [1, "invalid-record"],
        [2, "invalid-record"],
        [3, "invalid-record"],
        [4, "invalid-record"],
        [5, "invalid-record"],
      ],
    });
  });

  it("an invalid base field rejects the records that rely on it until it is replaced (RFC 8428 §4.6, our rule)", () => {
    expect(
      reasons([
        { n: "before", v: 1 },
        { bt: "yesterday", n: "a", v: 1 },
        { n: "b", v: 2 },
        { bt: 1.6e9, n: "c", v: 3 },
        { bu: 7, n: "d", u: "Cel", v: 4 }, // has its own unit: does not rely on bu
        { n: "e", v: 5 }, // relies on bu
      ]),
    ).toEqual({
      kept: ["c", "d", "before"],
      rejected: [
        [1, "invalid-record"],
        [2, "invalid-record"],
        [5, "invalid-record"],
      ],
    });
  });

  it("unknown labels without a trailing _ are ignored (RFC 8428 §4.4)", () => {
    expect(reasons([{ n: "a", v: 1, foo: "bar", ct: "60" }])).toEqual({ kept: ["a"], rejected: [] });
  });
});

describe("resolveSenmlPack — whole-pack refusals (RFC 8428 §4.4)", () => {
  const nowS = NOW_S;
  const refusal = (pack: unknown) => {
    const result = resolveSenmlPack(pack, { nowS });
    return result.ok ? "accepted" : result.reason;
  };

  it("not an array, or an empty array → not-a-pack (RFC 8428 §4.1: a pack is an array of records)", () => {
    expect(refusal({ n: "a", v: 1 })).toBe("not-a-pack");
    expect(refusal("[]")).toBe("not-a-pack");
    expect(refusal(null)).toBe("not-a-pack");
    expect(refusal([])).toBe("not-a-pack");
  });

  it("bver above 10 → unsupported-version; 10 and below are understood (RFC 8428 §4.4)", () => {
    expect(refusal([{ bver: 11, n: "a", v: 1 }])).toBe("unsupported-version");
    expect(refusal([{ bver: 10, n: "a", v: 1 }])).toBe("accepted");
    expect(refusal([{ bver: 0, n: "a", v: 1 }])).toBe("unsupported-version");
    expect(refusal([{ bver: "10", n: "a", v: 1 }])).toBe("unsupported-version");
    expect(refusal([{ n: "a", v: 1 }, { bver: 11, n: "b", v: 1 }])).toBe("unsupported-version");
  });

  it("records that disagree on bver → unsupported-version (RFC 8428 §4.4: one version per pack)", () => {
    expect(refusal([{ bver: 5, n: "a", v: 1 }, { bver: 6, n: "b", v: 1 }])).toBe("unsupported-version");
  });

  it("a label ending in _ is mandatory to understand → unknown-mandatory-field (RFC 8428 §4.4, §12.3)", () => {
    expect(refusal([{ n: "a", v: 1 }, { n: "b", v: 1, ct_: "60" }])).toBe("unknown-mandatory-field");
  });
});

describe("parseSenmlJson — text in", () => {
  it("malformed JSON → malformed-json, never a throw", () => {
    for (const text of ["", "[", "{\"n\":", "[{\"n\":\"a\",\"v\":NaN}]", "undefined", "[1,]"]) {
      const result = parseSenmlJson(text, { nowS: NOW_S });
      expect(result.ok ? "accepted" : result.reason).toBe("malformed-json");
    }
  });

  it("text over maxBytes (default 64 KiB) → not-a-pack, counted in UTF-8 bytes", () => {
    const record = `{"n":"a","v":1}`;
    const big = `[${Array.from({ length: 5000 }, () => record).join(",")}]`; // > 64 KiB
    const result = parseSenmlJson(big, { nowS: NOW_S });
    expect(result.ok ? "accepted" : result.reason).toBe("not-a-pack");
    // "é" is 2 bytes: 10 characters can be 11 bytes.
    const text = `["ééé1234"]`;
    expect(utf8ByteLength(text)).toBe(text.length + 3);
    const small = parseSenmlJson(text, { nowS: NOW_S, maxBytes: text.length });
    expect(small.ok ? "accepted" : small.reason).toBe("not-a-pack");
  });

  it("utf8ByteLength matches the UTF-8 definition (RFC 3629 §3) for 1-, 2-, 3- and 4-byte characters", () => {
    expect(utf8ByteLength("a")).toBe(1);
    expect(utf8ByteLength("é")).toBe(2);
    expect(utf8ByteLength("€")).toBe(3);
    expect(utf8ByteLength("🌱")).toBe(4);
    expect(utf8ByteLength("\ud800")).toBe(3); // lone surrogate → U+FFFD
  });
});

describe("SenML properties (fast-check)", () => {
  it("never throws on any JSON value or any text", () => {
    fc.assert(
      fc.property(fc.jsonValue(), (value) => {
        resolveSenmlPack(value, { nowS: NOW_S });
        parseSenmlJson(JSON.stringify(value) ?? "", { nowS: NOW_S });
      }),
    );
    fc.assert(fc.property(fc.string(), (text) => void parseSenmlJson(text, { nowS: NOW_S })));
  });

  it("every record of a pack is either resolved or rejected, exactly once (PRODUCT.md §4: never drop good records)", () => {
    const field = fc.oneof(fc.double(), fc.string(), fc.boolean(), fc.constant(null));
    const record = fc.dictionary(fc.constantFrom("n", "bn", "v", "vs", "t", "bt", "u", "bu", "s", "x"), field, { maxKeys: 6 });
    fc.assert(
      fc.property(fc.array(record, { minLength: 1, maxLength: 12 }), (pack) => {
        const result = resolveSenmlPack(pack, { nowS: NOW_S });
        if (!result.ok) return;
        const regularLabels = ["n", "u", "v", "vs", "vb", "vd", "s", "t", "ut"];
        const withRegular = pack.filter((r) => Object.keys(r).some((k) => regularLabels.includes(k))).length;
        expect(result.records.length + result.rejected.length).toBe(withRegular);
      }),
    );
  });

  it("an absolute time resolves to itself whatever now is (RFC 8428 §4.5.3)", () => {
    fc.assert(
      fc.property(fc.integer({ min: SENML_RELATIVE_TIME_LIMIT_S, max: NOW_S }), fc.integer({ min: NOW_S, max: 2 * NOW_S }), (t, nowS) => {
        const result = resolveSenmlPack([{ n: "a", v: 1, t }], { nowS });
        expect(result.ok && result.records[0]?.timeS).toBe(t);
      }),
    );
  });
});
