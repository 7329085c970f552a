import { describe, it, expect } from "vitest";
import fc from "fast-check";
import { maxGapMs, nightMinMax, timeInWindow, windowSegments, type TimedValue } from "./time-in-window.js";

// Air window 21–27 °C (70–80 °F band for fig cuttings; PRODUCT.md §1, REFERENCES.md §6, common practice).
const AIR = { min: 21, max: 27 };
const MIN = 60_000;
const T0 = Date.UTC(2025, 2, 2, 0, 0, 0);
const RULE = { expectedIntervalMs: MIN }; // gap limit 3 min (default multiple)
const HOUR = { fromMs: T0, toMs: T0 + 60 * MIN };

const at = (minute: number, value: number): TimedValue => ({ timeMs: T0 + minute * MIN, value });

// Irregular samples with a long gap; checked by hand against the issue 3 item 5 definitions.
const NIGHT: TimedValue[] = [
  at(0, 22),
  at(2, 22),
  at(4, 20),
  at(6, 20),
  at(7, 19),
  at(9, 23),
  at(12, 28),
  at(14, 24),
  // 16-minute silence: longer than 3 × 1 min → no data, never inside
  at(30, 24),
  at(31, 25),
  // last sample: held for at most 3 min, then no data to the end of the hour
];

describe("timeInWindow — irregular samples with gaps (issue 3 item 5; hand-computed)", () => {
  it("minutes inside / below / above / no data, and they add up to the period", () => {
    const result = timeInWindow(NIGHT, AIR, HOUR, RULE);
    expect(result.minutes).toEqual({ inside: 4 + 3 + 1 + 3, below: 5, above: 2, noData: 16 + 26 });
    expect(result.insideMs + result.belowMs + result.aboveMs + result.noDataMs).toBe(result.periodMs);
    expect(result.periodMs).toBe(60 * MIN);
  });

  it("the share inside, of the period and of the time with data", () => {
    const result = timeInWindow(NIGHT, AIR, HOUR, RULE);
    expect(result.insidePctOfPeriod).toBeCloseTo((100 * 11) / 60, 10);
    expect(result.insidePctOfData).toBeCloseTo((100 * 11) / 18, 10);
  });

  it("degree-hours below the minimum: (21−20)·3 min + (21−19)·2 min = 7 °C·min; above: (28−27)·2 min", () => {
    const result = timeInWindow(NIGHT, AIR, HOUR, RULE);
    expect(result.degreeHoursBelowMin).toBeCloseTo(7 / 60, 12);
    expect(result.degreeHoursAboveMax).toBeCloseTo(2 / 60, 12);
  });

  it("the state over time as segments", () => {
    const m = (minute: number) => T0 + minute * MIN;
    expect(windowSegments(NIGHT, AIR, HOUR, RULE)).toEqual([
      { startMs: m(0), endMs: m(4), status: "inside" },
      { startMs: m(4), endMs: m(9), status: "below" },
      { startMs: m(9), endMs: m(12), status: "inside" },
      { startMs: m(12), endMs: m(14), status: "above" },
      { startMs: m(14), endMs: m(30), status: "no-data" },
      { startMs: m(30), endMs: m(34), status: "inside" },
      { startMs: m(34), endMs: m(60), status: "no-data" },
    ]);
  });

  it("a gap exactly at the limit still counts as data; one ms longer is no data for its whole length", () => {
    const atLimit = timeInWindow([at(0, 24), at(3, 24)], AIR, { fromMs: T0, toMs: T0 + 3 * MIN }, RULE);
    expect(atLimit.insideMs).toBe(3 * MIN);
    const beyond = timeInWindow([at(0, 24), { timeMs: T0 + 3 * MIN + 1, value: 24 }], AIR, { fromMs: T0, toMs: T0 + 3 * MIN }, RULE);
    expect(beyond.insideMs).toBe(0);
    expect(beyond.noDataMs).toBe(3 * MIN);
  });

  it("the gap multiple is configurable", () => {
    expect(maxGapMs(RULE)).toBe(3 * MIN);
    expect(maxGapMs({ expectedIntervalMs: MIN, gapMultiple: 20 })).toBe(20 * MIN);
    const lenient = timeInWindow(NIGHT, AIR, HOUR, { expectedIntervalMs: MIN, gapMultiple: 20 });
    expect(lenient.minutes.noData).toBe(60 - 51); // the 16-minute gap now holds 24 °C; the tail holds 20 min
  });

  it("a sample before the period holds into it; one after closes the last gap", () => {
    const samples = [at(-1, 20), at(1, 24), at(62, 24)];
    const result = timeInWindow(samples, AIR, HOUR, { expectedIntervalMs: MIN, gapMultiple: 100 });
    expect(result.minutes).toEqual({ inside: 59, below: 1, above: 0, noData: 0 });
  });

  it("no samples, an empty or reversed period", () => {
    expect(timeInWindow([], AIR, HOUR, RULE)).toMatchObject({ noDataMs: 60 * MIN, insideMs: 0, insidePctOfPeriod: 0, insidePctOfData: null });
    expect(timeInWindow(NIGHT, AIR, { fromMs: T0, toMs: T0 }, RULE)).toMatchObject({ periodMs: 0, insidePctOfPeriod: null });
    expect(timeInWindow(NIGHT, AIR, { fromMs: T0 + MIN, toMs: T0 }, RULE)).toMatchObject({ periodMs: 0, noDataMs: 0 });
    expect(windowSegments([], AIR, { fromMs: T0, toMs: T0 }, RULE)).toEqual([]);
  });

  it("non-finite values are skipped, and samples may come in any order", () => {
    const shuffled = [...NIGHT].reverse();
    shuffled.splice(3, 0, { timeMs: T0 + 5 * MIN, value: Number.NaN });
    expect(timeInWindow(shuffled, AIR, HOUR, RULE)).toEqual(timeInWindow(NIGHT, AIR, HOUR, RULE));
  });
});

describe("nightMinMax (PRODUCT.md §5: the night's min/max on the walk-through card)", () => {
  it("lowest and highest sample in [from, to), earliest on a tie", () => {
    expect(nightMinMax([...NIGHT, at(45, 19)], HOUR)).toEqual({ min: at(7, 19), max: at(12, 28), count: NIGHT.length + 1 });
  });

  it("samples at toMs belong to the next period; none → null", () => {
    expect(nightMinMax([at(60, 30), at(59, 22)], HOUR)).toEqual({ min: at(59, 22), max: at(59, 22), count: 1 });
    expect(nightMinMax([at(61, 22)], HOUR)).toBeNull();
    expect(nightMinMax([{ timeMs: T0, value: Number.NaN }], HOUR)).toBeNull();
  });
});

// ---------------------------------------------------------------------------------------------
// Properties (issue 3 item 7: time-in-window parts add up to the period)

const samplesArb = fc.array(
  fc.record({ timeMs: fc.integer({ min: T0 - 30 * MIN, max: T0 + 150 * MIN }), value: fc.double({ min: 10, max: 36, noNaN: true }) }),
  { maxLength: 80 },
);
const ruleArb = fc.record({ expectedIntervalMs: fc.integer({ min: 1000, max: 10 * MIN }), gapMultiple: fc.integer({ min: 1, max: 5 }) });
const periodArb = fc
  .tuple(fc.integer({ min: T0 - 10 * MIN, max: T0 + 130 * MIN }), fc.integer({ min: 0, max: 120 * MIN }))
  .map(([fromMs, lengthMs]) => ({ fromMs, toMs: fromMs + lengthMs }));

describe("time-in-window properties (fast-check)", () => {
  it("inside + below + above + no data = the period, exactly", () => {
    fc.assert(
      fc.property(samplesArb, periodArb, ruleArb, (samples, period, rule) => {
        const r = timeInWindow(samples, AIR, period, rule);
        expect(r.insideMs + r.belowMs + r.aboveMs + r.noDataMs).toBe(period.toMs - period.fromMs);
      }),
    );
  });

  it("adjacent periods add up to the period that spans them", () => {
    fc.assert(
      fc.property(samplesArb, periodArb, fc.double({ min: 0, max: 1, noNaN: true }), ruleArb, (samples, period, fraction, rule) => {
        const midMs = period.fromMs + Math.floor(fraction * (period.toMs - period.fromMs));
        const a = timeInWindow(samples, AIR, { fromMs: period.fromMs, toMs: midMs }, rule);
        const b = timeInWindow(samples, AIR, { fromMs: midMs, toMs: period.toMs }, rule);
        const whole = timeInWindow(samples, AIR, period, rule);
        expect(a.insideMs + b.insideMs).toBe(whole.insideMs);
        expect(a.belowMs + b.belowMs).toBe(whole.belowMs);
        expect(a.aboveMs + b.aboveMs).toBe(whole.aboveMs);
        expect(a.noDataMs + b.noDataMs).toBe(whole.noDataMs);
        expect(a.degreeHoursBelowMin + b.degreeHoursBelowMin).toBeCloseTo(whole.degreeHoursBelowMin, 9);
      }),
    );
  });

  it("no data is never inside: each sample stands for at most the gap limit", () => {
    fc.assert(
      fc.property(samplesArb, periodArb, ruleArb, (samples, period, rule) => {
        const r = timeInWindow(samples, AIR, period, rule);
        expect(r.insideMs + r.belowMs + r.aboveMs).toBeLessThanOrEqual(samples.length * maxGapMs(rule));
        if (samples.length === 0) expect(r.noDataMs).toBe(r.periodMs);
      }),
    );
  });

  it("segments tile the period and agree with the totals", () => {
    fc.assert(
      fc.property(samplesArb, periodArb, ruleArb, (samples, period, rule) => {
        const segments = windowSegments(samples, AIR, period, rule);
        const totals = { inside: 0, below: 0, above: 0, "no-data": 0 };
        let cursor = period.fromMs;
        segments.forEach((s, i) => {
          expect(s.startMs).toBe(cursor);
          expect(s.endMs).toBeGreaterThan(s.startMs);
          if (i > 0) expect(s.status).not.toBe(segments[i - 1]!.status);
          totals[s.status] += s.endMs - s.startMs;
          cursor = s.endMs;
        });
        if (period.toMs > period.fromMs) expect(cursor).toBe(period.toMs);
        const r = timeInWindow(samples, AIR, period, rule);
        expect(totals).toEqual({ inside: r.insideMs, below: r.belowMs, above: r.aboveMs, "no-data": r.noDataMs });
      }),
    );
  });

  it("degree-hours are ≥ 0, and 0 below the minimum when nothing is below it", () => {
    fc.assert(
      fc.property(samplesArb, periodArb, ruleArb, (samples, period, rule) => {
        const r = timeInWindow(samples, AIR, period, rule);
        expect(r.degreeHoursBelowMin).toBeGreaterThanOrEqual(0);
        expect(r.degreeHoursAboveMax).toBeGreaterThanOrEqual(0);
        const warm = timeInWindow(samples.map((s) => ({ ...s, value: Math.max(s.value, AIR.min) })), AIR, period, rule);
        expect(warm.degreeHoursBelowMin).toBe(0);
        expect(warm.belowMs).toBe(0);
      }),
    );
  });

  it("night min ≤ every value in the period ≤ night max", () => {
    fc.assert(
      fc.property(samplesArb, periodArb, (samples, period) => {
        const extremes = nightMinMax(samples, period);
        const inPeriod = samples.filter((s) => s.timeMs >= period.fromMs && s.timeMs < period.toMs);
        if (extremes === null) return inPeriod.length === 0;
        return extremes.count === inPeriod.length && inPeriod.every((s) => extremes.min.value <= s.value && s.value <= extremes.max.value);
      }),
    );
  });
});
