import { describe, expect, it } from "vitest";
import { createRng } from "./random.js";

describe("createRng", () => {
  it("when given the same seed and stream, then gives the same sequence", () => {
    const a = createRng(42, "bench:1");
    const b = createRng(42, "bench:1");
    const xs = Array.from({ length: 100 }, () => a.next());
    const ys = Array.from({ length: 100 }, () => b.next());
    expect(xs).toEqual(ys);
  });

  it("when the seed or the stream differs, then the sequences differ", () => {
    const base = Array.from({ length: 20 }, createRng(42, "x").next);
    expect(Array.from({ length: 20 }, createRng(43, "x").next)).not.toEqual(base);
    expect(Array.from({ length: 20 }, createRng(42, "y").next)).not.toEqual(base);
  });

  it("draws uniform numbers in [0, 1) and normal numbers with mean 0 and deviation 1", () => {
    const rng = createRng(7);
    const n = 20_000;
    const u = Array.from({ length: n }, () => rng.next());
    expect(Math.min(...u)).toBeGreaterThanOrEqual(0);
    expect(Math.max(...u)).toBeLessThan(1);
    expect(u.reduce((s, x) => s + x, 0) / n).toBeCloseTo(0.5, 1);
    const z = Array.from({ length: n }, () => rng.normal());
    const mean = z.reduce((s, x) => s + x, 0) / n;
    const sd = Math.sqrt(z.reduce((s, x) => s + (x - mean) ** 2, 0) / n);
    expect(mean).toBeCloseTo(0, 1);
    expect(sd).toBeCloseTo(1, 1);
  });
});
