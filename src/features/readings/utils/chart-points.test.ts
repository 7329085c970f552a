import { describe, expect, it } from "vitest";
import type { SeriesPoint } from "../../../../shared/schemas/readings.js";
import { WINDOWS } from "../../../testing/data";
import { chartAxis, derivedPoints, outOfWindowStretches, summarizeSeries, timeAxis, toChartPoints } from "./chart-points";

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

describe("outOfWindowStretches", () => {
  it("joins out-of-window buckets on the same side into one stretch until a bucket back inside or a silence over 15 min", () => {
    // 21–27 °C window, 5-minute buckets: cold, cold, inside, warm, (10 min without data) warm, (30 min without data) warm.
    const points = toChartPoints(
      [point(0, 19), point(1, 20), point(2, 24), point(3, 28), point(5, 28), point(11, 28)],
      "air.temperature",
      "C",
      BUCKET_MS,
      airWindow,
    );
    expect(outOfWindowStretches(points, BUCKET_MS)).toEqual([
      { status: "below", startMs: 0, endMs: 2 * BUCKET_MS },
      // The reading at bucket 5 stands until the next one, but for at most 15 minutes (3 buckets).
      { status: "above", startMs: 3 * BUCKET_MS, endMs: 8 * BUCKET_MS },
      { status: "above", startMs: 11 * BUCKET_MS, endMs: 12 * BUCKET_MS },
    ]);
  });

  it("readings every 10 minutes on 3-minute buckets, all cold, are one stretch and count their whole time out", () => {
    const bucketMs = 3 * 60_000;
    const raw = Array.from({ length: 6 }, (_, i) => ({ timeMs: i * 600_000, min: 18, mean: 18, max: 18, count: 1 }));
    const points = toChartPoints(raw, "air.temperature", "C", bucketMs, airWindow);
    expect(outOfWindowStretches(points, bucketMs)).toEqual([{ status: "below", startMs: 0, endMs: 5 * 600_000 + bucketMs }]);
    expect(summarizeSeries(raw, bucketMs, airWindow)?.outMs).toBe(5 * 600_000 + bucketMs);
  });
});

describe("derivedPoints", () => {
  it("works out dew point and VPD per bucket from the mean air temperature and humidity, skipping buckets missing either", () => {
    const t = [point(0, 25), point(1, 25)];
    const rh: SeriesPoint[] = [{ timeMs: 0, min: 79, mean: 80, max: 81, count: 5 }];
    const [only, ...rest] = derivedPoints(t, rh);
    expect(rest).toEqual([]);
    // 25 °C, 80 % RH: dew point 21.31 °C (PsychroLib documentation, ASHRAE Handbook—Fundamentals 2017 method; REFERENCES.md §2), ±0.1 °C.
    expect(Math.abs(only!.dewPointC - 21.3094)).toBeLessThan(0.1);
    // VPD = e°(25 °C) · (1 − 0.8) = 3.168 · 0.2 kPa (FAO-56 eqs. 10–11, Annex 2 value).
    expect(only!.vpdKPa).toBeCloseTo(0.6336, 3);
  });
});

describe("timeAxis", () => {
  it("keeps about six labels whatever the range: every 6 h for a day, daily for a week, every 5 days for 30 days", () => {
    const start = new Date(2025, 0, 1, 0, 30).getTime();
    expect(timeAxis(start, start + 24 * 3_600_000).ticks).toHaveLength(4);
    expect(timeAxis(start, start + 7 * 86_400_000).ticks).toHaveLength(7);
    const month = timeAxis(start, start + 30 * 86_400_000).ticks;
    expect(month).toHaveLength(6);
    expect(new Date(month[1]!).getDate() - new Date(month[0]!).getDate()).toBe(5);
  });
});

describe("summarizeSeries up to now", () => {
  it("counts the newest, still-filling bucket only up to now", () => {
    const window = { quantity: "air.temperature" as const, min: 21, max: 27, delayS: 600, hysteresis: 0.5 };
    const bucketMs = 87 * 60_000; // a 30-day chart's bucket
    const start = 1_800_000_000_000;
    const points = [{ timeMs: start, min: 14, mean: 14, max: 14, count: 15 }];
    // Fifteen minutes into the bucket: 15 min out of window, not 87.
    expect(summarizeSeries(points, bucketMs, window, start + 15 * 60_000)?.outMs).toBe(15 * 60_000);
    expect(summarizeSeries(points, bucketMs, window)?.outMs).toBe(bucketMs);
  });
});
