import { describe, expect, it } from "vitest";
import type { SeriesPoint } from "../../../../shared/schemas/readings.js";
import { WINDOWS } from "../../../testing/data";
import { chartAxis, summarizeSeries, toChartPoints } from "./chart-points";

const BUCKET_MS = 5 * 60_000;
const airWindow = WINDOWS[0];

function point(i: number, mean: number, spread = 0.5): SeriesPoint {
  return { timeMs: i * BUCKET_MS, min: mean - spread, mean, max: mean + spread, count: 5 };
}

describe("toChartPoints", () => {
  it("converts to the display unit and classifies each bucket's mean against the window", () => {
    const [cold, warm] = toChartPoints([point(0, 20), point(1, 25)], "air.temperature", "F", BUCKET_MS, airWindow);
    expect(cold?.mean).toBeCloseTo(68);
    expect(cold?.range?.[0]).toBeCloseTo(67.1);
    expect(cold?.status).toBe("below");
    expect(warm?.status).toBe("inside");
    expect(warm?.si?.mean).toBe(25);
  });

  it("inserts a break where readings are missing, so the line is not drawn across the gap", () => {
    const points = toChartPoints([point(0, 24), point(1, 24), point(6, 24)], "air.temperature", "C", BUCKET_MS, airWindow);
    expect(points.map((p) => p.mean)).toEqual([24, 24, null, 24]);
    expect(points[2]?.timeMs).toBe(2 * BUCKET_MS);
  });

  it("shows moisture as percent", () => {
    const [p] = toChartPoints([point(0, 0.31, 0.01)], "medium.moisture", "F", BUCKET_MS, WINDOWS[3]);
    expect(p?.mean).toBeCloseTo(31);
  });
});

describe("chartAxis", () => {
  it("always includes the whole window, even when the data sits inside it", () => {
    const points = toChartPoints([point(0, 24)], "air.temperature", "C", BUCKET_MS, airWindow);
    const { domain } = chartAxis(points, "air.temperature", "C", airWindow);
    expect(domain[0]).toBeLessThan(21);
    expect(domain[1]).toBeGreaterThan(27);
  });

  it("puts the ticks on round numbers", () => {
    const points = toChartPoints([point(0, 14), point(1, 28)], "air.temperature", "F", BUCKET_MS, airWindow);
    const { ticks, domain } = chartAxis(points, "air.temperature", "F", airWindow);
    expect(ticks.every((t) => t % 5 === 0)).toBe(true);
    expect(ticks[0]).toBe(domain[0]);
    expect(ticks.at(-1)).toBe(domain[1]);
    expect(domain[0]).toBeLessThanOrEqual(56.3);
    expect(domain[1]).toBeGreaterThanOrEqual(83.3);
  });
});

describe("summarizeSeries", () => {
  it("gives the low, the high and the time spent out of window", () => {
    const summary = summarizeSeries([point(0, 18), point(1, 24), point(2, 28)], BUCKET_MS, airWindow);
    expect(summary).toMatchObject({ minSi: 17.5, maxSi: 28.5, outMs: 2 * BUCKET_MS, hasWindow: true });
    expect(summarizeSeries([], BUCKET_MS, airWindow)).toBeNull();
  });
});
