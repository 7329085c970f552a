import { describe, it, expect } from "vitest";
import fc from "fast-check";
import { QUANTITIES } from "../schemas/quantities.js";
import { PROBE_RANGE, quantityFromRecordName, readingsFromPayload } from "./sensor-readings.js";

/** Receiver clock: 2025-03-02T04:00:00Z (a night-shift hour). */
const NOW_MS = Date.UTC(2025, 2, 2, 4, 0, 0);
const NOW_S = NOW_MS / 1000;

function ok(text: string, options: Partial<Parameters<typeof readingsFromPayload>[1]> = {}) {
  const result = readingsFromPayload(text, { nowMs: NOW_MS, ...options });
  if (!result.ok) throw new Error(`refused: ${result.reason} ${result.detail}`);
  return result;
}

describe("readingsFromPayload — the PRODUCT.md §4 MQTT ingest contract", () => {
  it("a combined probe's pack with bn and relative times gives stored readings in time order (PRODUCT.md §4; RFC 8428 §4.5.3)", () => {
    const text = JSON.stringify([
      { bn: "urn:dev:bw-fig-bench-3:", bt: NOW_S, n: "air.temperature", u: "Cel", v: 23.4, t: -60 },
      { n: "air.humidity", u: "%RH", v: 86, t: -60 },
      { n: "medium.temperature", u: "K", v: 296.65, t: -60 },
      { n: "medium.moisture", u: "/", v: 0.42, t: -60 },
      { n: "battery", u: "%EL", v: 77 },
    ]);
    const { readings, rejected } = ok(text);
    expect(rejected).toEqual([]);
    expect(readings.map((r) => r.quantity)).toEqual(["air.temperature", "air.humidity", "medium.temperature", "medium.moisture", "battery"]);
    expect(readings.map((r) => r.timeMs)).toEqual([NOW_MS - 60_000, NOW_MS - 60_000, NOW_MS - 60_000, NOW_MS - 60_000, NOW_MS]);
    expect(readings[2]!.value).toBeCloseTo(23.5, 10); // K → °C, NIST SP 811: t/°C = T/K − 273.15
    expect(readings[3]!.value).toBe(0.42);
  });

  it("times are whole milliseconds (de-duplication on sensor, quantity, time: PRODUCT.md §4)", () => {
    const { readings } = ok(JSON.stringify([{ bt: 1.7e9 + 0.0004, n: "air.temperature", u: "Cel", v: 21 }]), {
      nowMs: 1.7e12 + 1000,
    });
    expect(readings[0]!.timeMs).toBe(1.7e12);
    expect(Number.isInteger(readings[0]!.timeMs)).toBe(true);
  });

  it("bad records are rejected with a reason and good ones kept (PRODUCT.md §4 bad readings)", () => {
    const text = JSON.stringify([
      { bn: "bw-prop-house-1/", n: "air.temperature", u: "Cel", v: 22.1 }, // 0 good
      { n: "air.temperature", u: "degF", v: 72 }, // 1 unit not accepted
      { n: "air.humidity", v: 80 }, // 2 no unit
      { n: "air.co2", u: "ppm", v: 400 }, // 3 not ours
      { n: "air.humidity", u: "%RH", v: 104 }, // 4 out of range
      { n: "medium.moisture", u: "/", v: 42 }, // 5 percent sent as a ratio: out of range
      { n: "air.temperature", u: "Cel", vs: "22.1" }, // 6 string where a number is needed
      { n: "battery", u: "%EL", vb: true }, // 7 boolean where a number is needed
      { n: "air.temperature", u: "Cel", t: 3600, v: 22 }, // 8 an hour in the future
      { n: "air.temperature", u: "Cel", t: -8 * 24 * 3600, v: 22 }, // 9 eight days old
      { n: "air.temperature", u: "Cel" }, // 10 no value
      { n: "air.temperature", u: "Cel", s: 5 }, // 11 a sum alone
      { n: "medium.temperature", u: "Cel", v: 21.7 }, // 12 good
    ]);
    const { readings, rejected } = ok(text);
    expect(readings.map((r) => [r.quantity, r.value])).toEqual([
      ["air.temperature", 22.1],
      ["medium.temperature", 21.7],
    ]);
    expect(rejected.map((r) => [r.index, r.reason])).toEqual([
      [1, "unit-not-accepted"],
      [2, "unit-not-accepted"],
      [3, "unknown-quantity"],
      [4, "out-of-range"],
      [5, "out-of-range"],
      [6, "wrong-value-type"],
      [7, "wrong-value-type"],
      [8, "time-in-future"],
      [9, "time-too-old"],
      [10, "missing-value"],
      [11, "missing-value"],
    ]);
    for (const r of rejected) expect(r.detail.length).toBeGreaterThan(0);
  });

  it("a malformed or oversized pack is refused whole (PRODUCT.md §4 bad readings)", () => {
    const malformed = readingsFromPayload("[{\"n\":\"air.temperature\",", { nowMs: NOW_MS });
    expect(malformed.ok ? "accepted" : malformed.reason).toBe("malformed-json");
    const oversized = readingsFromPayload(JSON.stringify([{ n: "battery", u: "%EL", v: 50 }]), { nowMs: NOW_MS, maxBytes: 10 });
    expect(oversized.ok ? "accepted" : oversized.reason).toBe("not-a-pack");
    const notPack = readingsFromPayload("{\"n\":\"battery\"}", { nowMs: NOW_MS });
    expect(notPack.ok ? "accepted" : notPack.reason).toBe("not-a-pack");
  });

  it("the probe range limits themselves are accepted (PROBE_RANGE is inclusive)", () => {
    const text = JSON.stringify(
      QUANTITIES.flatMap((q, i) => [
        { n: q, u: ["Cel", "%RH", "Cel", "/", "%EL"][i], v: PROBE_RANGE[q].min },
        { n: q, u: ["Cel", "%RH", "Cel", "/", "%EL"][i], v: PROBE_RANGE[q].max },
      ]),
    );
    const { readings, rejected } = ok(text);
    expect(rejected).toEqual([]);
    expect(readings).toHaveLength(2 * QUANTITIES.length);
  });

  it("maxFutureMs and maxAgeMs are configurable", () => {
    const text = JSON.stringify([
      { n: "battery", u: "%EL", v: 50, t: 120 },
      { n: "battery", u: "%EL", v: 50, t: -7200 },
    ]);
    const strict = ok(text, { maxFutureMs: 60_000, maxAgeMs: 3_600_000 });
    expect(strict.rejected.map((r) => r.reason)).toEqual(["time-in-future", "time-too-old"]);
    expect(ok(text).readings).toHaveLength(2);
  });
});

describe("quantityFromRecordName", () => {
  it("matches a bare quantity, or one after ':', '/' or '.' (issue 3 API)", () => {
    expect(quantityFromRecordName("air.temperature")).toBe("air.temperature");
    expect(quantityFromRecordName("urn:dev:bw-x:air.temperature")).toBe("air.temperature");
    expect(quantityFromRecordName("bw-x/medium.temperature")).toBe("medium.temperature");
    expect(quantityFromRecordName("probe7.battery")).toBe("battery");
    expect(quantityFromRecordName("urn:dev:bw-x:medium.moisture")).toBe("medium.moisture");
  });

  it("refuses glued or partial names", () => {
    expect(quantityFromRecordName("xair.temperature")).toBeUndefined();
    expect(quantityFromRecordName("air.temperature2")).toBeUndefined();
    expect(quantityFromRecordName("temperature")).toBeUndefined();
    expect(quantityFromRecordName("Air.Temperature")).toBeUndefined();
    expect(quantityFromRecordName("urn:dev:bw-x:")).toBeUndefined();
  });
});

describe("readingsFromPayload properties (fast-check)", () => {
  it("never throws, and every record is a reading or a rejection (PRODUCT.md §4: never crash, never drop good records)", () => {
    const record = fc.record(
      {
        n: fc.oneof(fc.constantFrom(...QUANTITIES), fc.string()),
        u: fc.constantFrom("Cel", "K", "%RH", "/", "%EL", "V", ""),
        v: fc.oneof(fc.double({ noNaN: true, noDefaultInfinity: true }), fc.string(), fc.boolean()),
        t: fc.integer({ min: -10 * 24 * 3600, max: 3600 }),
      },
      { requiredKeys: ["n"] },
    );
    fc.assert(
      fc.property(fc.array(record, { minLength: 1, maxLength: 10 }), (pack) => {
        const result = readingsFromPayload(JSON.stringify(pack), { nowMs: NOW_MS });
        if (!result.ok) return;
        expect(result.readings.length + result.rejected.length).toBe(pack.length);
        for (const reading of result.readings) {
          const range = PROBE_RANGE[reading.quantity];
          expect(reading.value).toBeGreaterThanOrEqual(range.min);
          expect(reading.value).toBeLessThanOrEqual(range.max);
          expect(Number.isInteger(reading.timeMs)).toBe(true);
        }
      }),
    );
  });

  it("a Kelvin reading and its Celsius twin are stored alike (NIST SP 811: T/K = t/°C + 273.15)", () => {
    fc.assert(
      fc.property(fc.double({ min: -40, max: 85, noNaN: true }), (tC) => {
        const result = ok(JSON.stringify([{ n: "air.temperature", u: "K", v: tC + 273.15 }]));
        const reading = result.readings[0];
        if (reading === undefined) return result.rejected[0]?.reason === "out-of-range"; // rounding at the limits
        return Math.abs(reading.value - tC) < 1e-9;
      }),
    );
  });
});
