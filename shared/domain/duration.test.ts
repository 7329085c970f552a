import { describe, expect, it } from "vitest";
import { describeDurationS, parseDurationMs } from "./duration.js";

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

describe("describeDurationS", () => {
  it.each([
    [45, "45 seconds"],
    [60, "1 minute"],
    [20 * 60, "20 minutes"],
    [3600, "1 hour"],
    [5400, "1 hour 30 minutes"],
    [12 * 3600, "12 hours"],
    [3661, "1 hour 1 minute"],
  ])("%d s is %s", (seconds, words) => expect(describeDurationS(seconds)).toBe(words));
});
