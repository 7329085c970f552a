import { describe, expect, it } from "vitest";
import { parseDurationMs } from "./duration.js";

describe("parseDurationMs", () => {
  it.each([
    ["500ms", 500],
    ["5s", 5000],
    ["10m", 600_000],
    ["2h", 7_200_000],
    ["1d", 86_400_000],
    ["90", 90_000],
    ["1.5m", 90_000],
  ])("%s is %d ms", (text, ms) => expect(parseDurationMs(text)).toBe(ms));

  it.each(["", "-5s", "ten minutes", "5 weeks", "1e3s"])("refuses %j", (text) => expect(parseDurationMs(text)).toBeUndefined());
});
