import { describe, it, expect } from "vitest";
import fc from "fast-check";
import {
  batchTally,
  calendarDayNumber,
  checkBatchCounts,
  daysBetween,
  daysToFirst,
  daysToFirstStage,
  BATCH_STAGES,
  currentStage,
  hasReachedStage,
  latestCounts,
  lossRate,
  pooledInsidePct,
  placementAt,
  pooledStrikeRate,
  strikeRate,
  summariseDays,
} from "./batch.js";

// Definitions: strike rate = rooted / stuck (PRODUCT.md §3, the trade's own word); loss rate = lost / stuck.

describe("strike rate and losses (PRODUCT.md §3 definitions)", () => {
  it("412 of 500 'Harbour Amber' fig cuttings rooted (invented variety) → 82.4 %", () => {
    expect(strikeRate({ stuck: 500, rooted: 412, lost: 31 })).toEqual({ ok: true, value: 0.824 });
    expect(lossRate({ stuck: 500, rooted: 412, lost: 31 })).toEqual({ ok: true, value: 0.062 });
  });

  it("tally: pending = stuck − rooted − lost", () => {
    expect(batchTally({ stuck: 240, rooted: 90, lost: 12 })).toEqual({
      ok: true,
      value: { stuck: 240, rooted: 90, lost: 12, pending: 138, strikeRate: 0.375, lossRate: 0.05 },
    });
  });

  it("nothing stuck yet: the tally has null rates, strikeRate is refused", () => {
    expect(batchTally({ stuck: 0, rooted: 0, lost: 0 })).toEqual({
      ok: true,
      value: { stuck: 0, rooted: 0, lost: 0, pending: 0, strikeRate: null, lossRate: null },
    });
    const refused = strikeRate({ stuck: 0, rooted: 0, lost: 0 });
    expect(!refused.ok && refused.reason).toBe("nothing-stuck");
  });

  it("counts that do not add up are refused (issue 3 item 6)", () => {
    const over = checkBatchCounts({ stuck: 100, rooted: 80, lost: 21 });
    expect(!over.ok && over.reason).toBe("counts-exceed-stuck");
    const zeroStuck = strikeRate({ stuck: 0, rooted: 1, lost: 0 });
    expect(!zeroStuck.ok && zeroStuck.reason).toBe("counts-exceed-stuck");
    for (const bad of [{ stuck: -1, rooted: 0, lost: 0 }, { stuck: 10.5, rooted: 0, lost: 0 }, { stuck: 10, rooted: Number.NaN, lost: 0 }]) {
      const result = batchTally(bad);
      expect(!result.ok && result.reason).toBe("not-a-count");
    }
  });

  it("pooled strike rate weighs batches by size: (90 + 10) / (100 + 100) = 50 %, not the mean of rates", () => {
    expect(pooledStrikeRate([{ stuck: 100, rooted: 90, lost: 0 }, { stuck: 100, rooted: 10, lost: 5 }])).toEqual({ ok: true, value: 0.5 });
    expect(pooledStrikeRate([{ stuck: 300, rooted: 270, lost: 0 }, { stuck: 100, rooted: 10, lost: 0 }])).toEqual({ ok: true, value: 0.7 });
    const bad = pooledStrikeRate([{ stuck: 10, rooted: 5, lost: 0 }, { stuck: 10, rooted: 11, lost: 0 }]);
    expect(!bad.ok && bad.reason).toBe("counts-exceed-stuck");
    const empty = pooledStrikeRate([]);
    expect(!empty.ok && empty.reason).toBe("nothing-stuck");
  });
});

describe("days from sticking to callus and roots", () => {
  const stuckOn = "2025-01-20";
  const observations = [
    { date: "2025-01-27", stage: "stuck" },
    { date: "2025-02-10", stage: "callused" },
    { date: "2025-02-03", stage: "stuck" },
    { date: "2025-02-24", stage: "root-initials" },
    { date: "2025-03-10", stage: "rooted" },
  ];

  it("first callus 21 days, first root initials 35 days, rooted 49 days", () => {
    expect(daysToFirstStage(stuckOn, observations, "callused")).toEqual({ ok: true, value: 21 });
    expect(daysToFirstStage(stuckOn, observations, "root-initials")).toEqual({ ok: true, value: 35 });
    expect(daysToFirstStage(stuckOn, observations, "rooted")).toEqual({ ok: true, value: 49 });
  });

  it("a later stage implies the earlier ones: roots seen first still dates the callus", () => {
    expect(daysToFirstStage(stuckOn, [{ date: "2025-02-24", stage: "root-initials" }], "callused")).toEqual({ ok: true, value: 35 });
    expect(hasReachedStage("bud-break", "callused")).toBe(false);
  });

  it("not reached yet → null; a generic predicate works too", () => {
    expect(daysToFirstStage(stuckOn, observations.slice(0, 1), "callused")).toEqual({ ok: true, value: null });
    expect(daysToFirst(stuckOn, [{ date: "2025-02-01", mould: true }], (o) => o.mould)).toEqual({ ok: true, value: 12 });
  });

  it("invalid dates and observations before sticking are refused", () => {
    const early = daysToFirstStage(stuckOn, [{ date: "2025-01-19", stage: "callused" }], "callused");
    expect(!early.ok && early.reason).toBe("date-before-sticking");
    const invalid = daysToFirstStage("2025-02-30", [], "callused");
    expect(!invalid.ok && invalid.reason).toBe("invalid-date");
    const badObservation = daysToFirstStage(stuckOn, [{ date: "10/02/2025", stage: "callused" }], "callused");
    expect(!badObservation.ok && badObservation.reason).toBe("invalid-date");
  });

  it("calendar days across month ends, a leap day and a DST change are whole days (proleptic Gregorian calendar)", () => {
    expect(daysBetween("2024-02-28", "2024-03-01")).toEqual({ ok: true, value: 2 }); // 2024 is a leap year
    expect(daysBetween("2025-02-28", "2025-03-01")).toEqual({ ok: true, value: 1 });
    expect(daysBetween("2025-03-08", "2025-03-10")).toEqual({ ok: true, value: 2 });
    expect(daysBetween("2025-03-10", "2025-03-08")).toEqual({ ok: true, value: -2 });
    expect(calendarDayNumber("1970-01-01")).toBe(0);
    expect(calendarDayNumber("2023-02-29")).toBeUndefined();
  });
});

describe("stages, counts so far and summaries (issue 6 §1)", () => {
  // The stage path stuck → callused → root initials → rooted → potted on is common practice for stem cuttings.
  it("potted on implies rooted; lost reaches no stage on the path", () => {
    expect(hasReachedStage("potted-on", "rooted")).toBe(true);
    expect(hasReachedStage("rooted", "potted-on")).toBe(false);
    expect(hasReachedStage("lost", "callused")).toBe(false);
    expect(BATCH_STAGES).toEqual(["stuck", "callused", "root-initials", "rooted", "potted-on", "lost"]);
  });

  it("the current stage is the latest observation's (by date, then recorded time); none → stuck", () => {
    expect(currentStage([])).toBe("stuck");
    expect(
      currentStage([
        { date: "2025-02-10", stage: "root-initials", recordedAtMs: 1 },
        { date: "2025-02-10", stage: "callused", recordedAtMs: 2 },
        { date: "2025-02-03", stage: "rooted" },
      ]),
    ).toBe("callused");
  });

  it("counts are running totals: the latest count of each wins, independently; never counted → 0", () => {
    const observations = [
      { date: "2025-02-10", stage: "callused", rooted: null, lost: 3 },
      { date: "2025-03-01", stage: "rooted", rooted: 120, lost: null },
      { date: "2025-02-20", stage: "root-initials", rooted: 40, lost: 5 },
    ];
    expect(latestCounts(observations)).toEqual({ rooted: 120, lost: 5 });
    expect(latestCounts([])).toEqual({ rooted: 0, lost: 0 });
  });

  it("days summary: mean and median (middle value; mean of the two middle for an even count) of those reached", () => {
    expect(summariseDays([21, null, 35, 28])).toEqual({ reached: 3, of: 4, meanDays: 28, medianDays: 28 });
    expect(summariseDays([20, 30, 31, 40])).toEqual({ reached: 4, of: 4, meanDays: 30.25, medianDays: 30.5 });
    expect(summariseDays([null, null])).toEqual({ reached: 0, of: 2, meanDays: null, medianDays: null });
  });

  it("pooled share inside weighs stretches by their time with data: (9 h + 1 h) / (10 h + 10 h) = 50 %", () => {
    const h = 3_600_000;
    expect(pooledInsidePct([{ insideMs: 9 * h, dataMs: 10 * h }, { insideMs: 1 * h, dataMs: 10 * h }])).toBe(50);
    expect(pooledInsidePct([{ insideMs: 9 * h, dataMs: 10 * h }, { insideMs: 0, dataMs: 0 }])).toBe(90);
    expect(pooledInsidePct([])).toBeNull();
  });
});

describe("batch properties (fast-check)", () => {
  const validCounts = fc
    .tuple(fc.integer({ min: 0, max: 100_000 }), fc.double({ min: 0, max: 1, noNaN: true }), fc.double({ min: 0, max: 1, noNaN: true }))
    .map(([stuck, a, b]) => {
      const rooted = Math.floor(a * stuck);
      return { stuck, rooted, lost: Math.floor(b * (stuck - rooted)) };
    });

  it("for valid counts: 0 ≤ strike rate, strike + loss ≤ 1, pending ≥ 0", () => {
    fc.assert(
      fc.property(validCounts, (counts) => {
        const tally = batchTally(counts);
        if (!tally.ok) return false;
        const { pending, strikeRate: s, lossRate: l } = tally.value;
        if (counts.stuck === 0) return s === null && l === null && pending === 0;
        return s !== null && l !== null && s >= 0 && l >= 0 && s + l <= 1 + 1e-12 && pending >= 0;
      }),
    );
  });

  it("pooled strike rate lies between the lowest and highest batch strike rates", () => {
    fc.assert(
      fc.property(fc.array(validCounts.filter((c) => c.stuck > 0), { minLength: 1, maxLength: 8 }), (batches) => {
        const pooled = pooledStrikeRate(batches);
        if (!pooled.ok) return false;
        const rates = batches.map((b) => b.rooted / b.stuck);
        return pooled.value >= Math.min(...rates) - 1e-12 && pooled.value <= Math.max(...rates) + 1e-12;
      }),
    );
  });

  it("daysBetween(a, b) + daysBetween(b, c) = daysBetween(a, c)", () => {
    const date = fc.date({ min: new Date(Date.UTC(2000, 0, 1)), max: new Date(Date.UTC(2100, 0, 1)), noInvalidDate: true }).map((d) => d.toISOString().slice(0, 10));
    fc.assert(
      fc.property(date, date, date, (a, b, c) => {
        const ab = daysBetween(a, b);
        const bc = daysBetween(b, c);
        const ac = daysBetween(a, c);
        return ab.ok && bc.ok && ac.ok && ab.value + bc.value === ac.value;
      }),
    );
  });
});

describe("the bench a batch stood on at an instant", () => {
  const placements = [
    { benchId: 2, fromMs: 5_000, toMs: 9_000 },
    { benchId: 1, fromMs: 1_000, toMs: 5_000 },
    { benchId: 3, fromMs: 12_000, toMs: null },
  ];

  it("is the placement whose [from, to) holds it: a move's instant belongs to the new bench", () => {
    expect(placementAt(placements, 1_000)?.benchId).toBe(1);
    expect(placementAt(placements, 4_999)?.benchId).toBe(1);
    expect(placementAt(placements, 5_000)?.benchId).toBe(2);
    expect(placementAt(placements, 99_999)?.benchId).toBe(3);
  });

  it("outside every placement: the latest one begun by then, else the first; nothing without placements", () => {
    expect(placementAt(placements, 10_000)?.benchId).toBe(2); // a gap after bench 2
    expect(placementAt(placements, 10)?.benchId).toBe(1); // before the batch was placed
    expect(placementAt([], 10)).toBeUndefined();
  });
});
