import { describe, expect, it } from "vitest";
import { addDays, localDate, localMidnightMs, localTimeToMs, observationTime, roundLookbackStartMs } from "./batch-calendar.js";

// Time-zone rules are those of the IANA tz database as the platform's Intl carries them; US daylight
// saving starts on the second Sunday in March and ends on the first Sunday in November (15 U.S.C. § 260a).
const CHICAGO = "America/Chicago";

describe("site-local dates and times", () => {
  it("an instant's local date: 03:30 UTC on 15 Jan is still 14 Jan in Chicago (UTC−6)", () => {
    expect(localDate(Date.UTC(2025, 0, 15, 3, 30), CHICAGO)).toBe("2025-01-14");
    expect(localDate(Date.UTC(2025, 0, 15, 3, 30), "UTC")).toBe("2025-01-15");
  });

  it("local wall time → instant, standard and daylight time", () => {
    expect(localTimeToMs("2025-01-14", 18 * 60, CHICAGO)).toBe(Date.UTC(2025, 0, 15, 0, 0)); // CST = UTC−6
    expect(localTimeToMs("2025-07-14", 18 * 60, CHICAGO)).toBe(Date.UTC(2025, 6, 14, 23, 0)); // CDT = UTC−5
    expect(localMidnightMs("2025-01-20", CHICAGO)).toBe(Date.UTC(2025, 0, 20, 6, 0));
    expect(localTimeToMs("2025-02-30", 0, CHICAGO)).toBeUndefined();
  });

  it("across the spring-forward night (9 Mar 2025): 02:30 does not exist and moves on by the gap to 03:30 CDT (Temporal 'compatible'); 01:30 is CST", () => {
    expect(localTimeToMs("2025-03-09", 2 * 60 + 30, CHICAGO)).toBe(Date.UTC(2025, 2, 9, 8, 30));
    expect(localTimeToMs("2025-03-09", 90, CHICAGO)).toBe(Date.UTC(2025, 2, 9, 7, 30));
  });

  it("across the fall-back night (2 Nov 2025): 01:30 happens twice and resolves to the first (CDT)", () => {
    expect(localTimeToMs("2025-11-02", 90, CHICAGO)).toBe(Date.UTC(2025, 10, 2, 6, 30));
  });

  it("the walk-through looks back to 18:00 local the day before, also on the morning after a DST change", () => {
    expect(roundLookbackStartMs(Date.UTC(2025, 0, 15, 13, 0), CHICAGO)).toBe(Date.UTC(2025, 0, 15, 0, 0)); // 07:00 CST → 18:00 CST on the 14th
    expect(roundLookbackStartMs(Date.UTC(2025, 2, 10, 12, 0), CHICAGO)).toBe(Date.UTC(2025, 2, 9, 23, 0)); // 07:00 CDT on the 10th → 18:00 CDT on the 9th
    expect(roundLookbackStartMs(Date.UTC(2025, 2, 9, 12, 0), CHICAGO)).toBe(Date.UTC(2025, 2, 9, 0, 0)); // 07:00 CDT on the 9th → 18:00 CST on the 8th
  });

  it("calendar days forward and back across month and year ends", () => {
    expect(addDays("2025-01-01", -1)).toBe("2024-12-31");
    expect(addDays("2024-02-28", 1)).toBe("2024-02-29");
    expect(addDays("not a date", 1)).toBeUndefined();
  });

  it("an observation recorded on the day it names is placed at its recording; one entered on a later day at local noon of its date", () => {
    // 07:40 CST on 15 Jan, recorded that morning.
    expect(observationTime("2025-01-15", Date.UTC(2025, 0, 15, 13, 40), CHICAGO)).toEqual({ timeMs: Date.UTC(2025, 0, 15, 13, 40), isDateOnly: false });
    // 15 Jan entered at 08:00 CST on the 16th: only the day is known → 12:00 CST on the 15th.
    expect(observationTime("2025-01-15", Date.UTC(2025, 0, 16, 14, 0), CHICAGO)).toEqual({ timeMs: Date.UTC(2025, 0, 15, 18, 0), isDateOnly: true });
    // 21:00 CST on the 15th is already the 16th in UTC: the site's date decides, so it stays the recording time.
    expect(observationTime("2025-01-15", Date.UTC(2025, 0, 16, 3, 0), CHICAGO)).toEqual({ timeMs: Date.UTC(2025, 0, 16, 3, 0), isDateOnly: false });
    // Noon in daylight time is 17:00 UTC.
    expect(observationTime("2025-07-01", Date.UTC(2025, 6, 3, 12, 0), CHICAGO)).toEqual({ timeMs: Date.UTC(2025, 6, 1, 17, 0), isDateOnly: true });
  });
});
