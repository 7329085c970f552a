import { describe, expect, it } from "vitest";
import type { z } from "zod";
import { packSchema } from "../testing/pack-schema.js";
import { baseName, buildReadingPack, encodePack, readingsTopic, statusTopic } from "./senml.js";

/** RFC 8428 §4.6 resolution of the fields this builder writes. */
function resolve(pack: z.infer<typeof packSchema>) {
  let bn = "";
  let bt = 0;
  return pack.map((r) => {
    if (r.bn !== undefined) bn = r.bn;
    if (r.bt !== undefined) bt = r.bt;
    return { name: bn + r.n, unit: r.u, value: r.v, time: bt + (r.t ?? 0) };
  });
}

describe("buildReadingPack", () => {
  it("when given one combined sample, then it writes the pack of PRODUCT.md §4", () => {
    const pack = buildReadingPack("s-17", [
      {
        timeMs: 1_765_000_000_123,
        values: { "air.temperature": 22.4, "air.humidity": 81, "medium.temperature": 23.1, "medium.moisture": 0.452, battery: 93 },
      },
    ]);
    expect(pack).toEqual([
      { bn: "urn:dev:bw:s-17:", bt: 1_765_000_000.123, n: "air.temperature", u: "Cel", v: 22.4 },
      { n: "air.humidity", u: "%RH", v: 81 },
      { n: "medium.temperature", u: "Cel", v: 23.1 },
      { n: "medium.moisture", u: "/", v: 0.452 },
      { n: "battery", u: "%EL", v: 93 },
    ]);
    expect(packSchema.safeParse(JSON.parse(encodePack(pack))).success).toBe(true);
  });

  it("when given several samples, then older ones carry negative relative times and the battery comes once", () => {
    const t0 = 1_765_000_000_000;
    const pack = buildReadingPack("a1", [
      { timeMs: t0, values: { "air.temperature": 22, "air.humidity": 80, battery: 90 } },
      { timeMs: t0 + 5000, values: { "air.temperature": 22.1, "air.humidity": 80, battery: 90 } },
      { timeMs: t0 + 10_000, values: { "air.temperature": 22.2, "air.humidity": 79, battery: 89 } },
    ]);
    expect(packSchema.parse(pack)).toHaveLength(7);
    const resolved = resolve(packSchema.parse(pack));
    expect(resolved.filter((r) => r.name === "urn:dev:bw:a1:air.temperature").map((r) => [r.time, r.value])).toEqual([
      [1_765_000_000, 22],
      [1_765_000_005, 22.1],
      [1_765_000_010, 22.2],
    ]);
    expect(resolved.filter((r) => r.name.endsWith(":battery"))).toEqual([
      { name: "urn:dev:bw:a1:battery", unit: "%EL", value: 89, time: 1_765_000_010 },
    ]);
    expect(pack[0]?.bt).toBe(1_765_000_010);
  });

  it("refuses an empty list and non-finite values", () => {
    expect(() => buildReadingPack("x", [])).toThrow(RangeError);
    expect(() => buildReadingPack("x", [{ timeMs: 0, values: { "air.temperature": Number.NaN } }])).toThrow(/finite/);
    expect(() => buildReadingPack("x", [{ timeMs: 0, values: {} }])).toThrow(/no values/);
  });

  it("names topics and the base name after the sensor", () => {
    expect(readingsTopic("s-1")).toBe("benchwarden/v1/sensors/s-1/readings");
    expect(statusTopic("s-1")).toBe("benchwarden/v1/sensors/s-1/status");
    expect(baseName("s-1")).toBe("urn:dev:bw:s-1:");
  });
});
