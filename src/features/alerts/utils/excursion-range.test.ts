import { describe, expect, it } from "vitest";
import { NOW_MS, makeAlert } from "../../../testing/data";
import { excursionQuantities, excursionRange } from "./excursion-range";

const HOUR_MS = 3_600_000;

describe("excursionRange", () => {
  it("an open alert: from 2 h before it to now, the same however the clock moves", () => {
    const alert = makeAlert({ sinceMs: NOW_MS - 5 * HOUR_MS });
    expect(excursionRange(alert, NOW_MS)).toEqual({ fromMs: NOW_MS - 7 * HOUR_MS });
    expect(excursionRange(alert, NOW_MS + 10 * 60_000)).toEqual(excursionRange(alert, NOW_MS));
  });

  it("a cleared alert: half its length either side, between 2 h and 6 h, ending at now if that is sooner", () => {
    const long = makeAlert({ sinceMs: NOW_MS - 30 * HOUR_MS, clearedAtMs: NOW_MS - 20 * HOUR_MS });
    expect(excursionRange(long, NOW_MS)).toEqual({ fromMs: NOW_MS - 35 * HOUR_MS, toMs: NOW_MS - 15 * HOUR_MS });
    const recent = makeAlert({ sinceMs: NOW_MS - 2 * HOUR_MS, clearedAtMs: NOW_MS - HOUR_MS });
    expect(excursionRange(recent, NOW_MS)).toEqual({ fromMs: NOW_MS - 4 * HOUR_MS });
  });

  it("charts the alert's own quantity, air temperature and humidity for condensation", () => {
    expect(excursionQuantities(makeAlert())).toEqual(["air.temperature"]);
    expect(excursionQuantities(makeAlert({ kind: "condensation", quantity: null }))).toEqual(["air.temperature", "air.humidity"]);
  });
});
