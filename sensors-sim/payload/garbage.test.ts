import { describe, expect, it } from "vitest";
import { QUANTITIES, STORED_UNIT } from "../../shared/schemas/quantities.js";
import { createRng } from "../model/random.js";
import { GARBAGE_KINDS, OVERSIZED_BYTES, garbagePayload, type GarbageKind } from "./garbage.js";
import { readingsTopic } from "./senml.js";

const ctx = () => ({
  sensorId: "g-1",
  timeMs: 1_765_000_000_000,
  values: { "air.temperature": 22.5, "air.humidity": 80, battery: 88 },
  rng: createRng(1, "garbage"),
});

function parse(payload: string | Buffer): unknown {
  return JSON.parse(typeof payload === "string" ? payload : payload.toString("utf8"));
}

describe("garbagePayload", () => {
  it("builds every kind, each on the sensor's own topic except wrong-topic", () => {
    for (const kind of GARBAGE_KINDS) {
      const g = garbagePayload(kind, ctx());
      expect(g.kind).toBe(kind);
      expect(g.note.length).toBeGreaterThan(0);
      if (kind === "wrong-topic") expect(g.topic).not.toBe(readingsTopic("g-1"));
      else expect(g.topic).toBe(readingsTopic("g-1"));
    }
  });

  const unreadable: GarbageKind[] = ["not-json", "nan-value", "binary"];
  it.each(unreadable)("%s is not JSON", (kind) => {
    expect(() => parse(garbagePayload(kind, ctx()).payload)).toThrow();
  });

  it("binary is not UTF-8 either", () => {
    const { payload } = garbagePayload("binary", ctx());
    expect(Buffer.isBuffer(payload)).toBe(true);
    expect(() => new TextDecoder("utf-8", { fatal: true }).decode(payload as Buffer)).toThrow();
  });

  it("the JSON kinds break exactly the rule they are named after", () => {
    const json = (kind: GarbageKind) => parse(garbagePayload(kind, ctx()).payload) as Array<Record<string, unknown>>;
    expect(Array.isArray(json("not-a-pack"))).toBe(false);
    expect(json("empty-pack")).toEqual([]);
    expect(json("unknown-unit")[0]?.u).toBe("degF");
    expect(json("string-value")[0]?.v).toBe("NaN");
    expect(json("out-of-range").map((r) => r.v)).toEqual([412.5, 140, 1.7]);
    expect(json("future-time")[0]?.bt).toBe(1_765_000_000 + 10 * 86_400);
    expect(QUANTITIES).not.toContain(json("unknown-quantity")[0]?.n);
    expect(String(json("bad-name")[0]?.n)).toMatch(/ /);
    expect(Object.keys(json("mandatory-label")[0] ?? {}).some((k) => k.endsWith("_"))).toBe(true);
    expect(json("bver-too-high")[0]?.bver).toBe(99);
  });

  it("mixed-pack holds good records around one bad one", () => {
    const g = garbagePayload("mixed-pack", ctx());
    expect(g.expect).toBe("reject-record");
    const records = parse(g.payload) as Array<{ n: string; u: string; v: number }>;
    expect(records.map((r) => r.n)).toEqual(["air.temperature", "air.humidity", "battery"]);
    expect(records[0]).toMatchObject({ u: STORED_UNIT["air.temperature"], v: 22.5 });
    expect(records[1]?.v).toBeLessThan(0);
  });

  it("oversized is valid JSON of at least the stated size", () => {
    const { payload } = garbagePayload("oversized", ctx());
    expect(Buffer.byteLength(payload)).toBeGreaterThanOrEqual(OVERSIZED_BYTES);
    expect(Array.isArray(parse(payload))).toBe(true);
  });
});
