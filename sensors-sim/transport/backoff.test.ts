import { describe, expect, it } from "vitest";
import { backoffDelayMs } from "./backoff.js";

describe("backoffDelayMs", () => {
  const o = { initialMs: 500, maxMs: 30_000, factor: 2 };

  it("doubles per attempt, between half and all of the ceiling", () => {
    expect(backoffDelayMs(0, 0, o)).toBe(250);
    expect(backoffDelayMs(0, 0.999_999, o)).toBe(500);
    expect(backoffDelayMs(3, 0, o)).toBe(2000);
    expect(backoffDelayMs(3, 0.5, o)).toBe(3000);
  });

  it("stops growing at the maximum", () => {
    expect(backoffDelayMs(20, 0, o)).toBe(15_000);
    expect(backoffDelayMs(200, 0.999_999, o)).toBe(30_000);
  });
});
