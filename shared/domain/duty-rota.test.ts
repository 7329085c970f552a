import { describe, expect, it } from "vitest";
import { EVERY_DAY, clockTime, describeWeekdays, localWeekdayMinute, shiftCovers, usersOnDuty, type RotaShift } from "./duty-rota.js";

const night: RotaShift = { zoneId: null, userId: 7, weekdays: EVERY_DAY, startMinute: 18 * 60, endMinute: 7 * 60, isFallback: false };
const fridayNight: RotaShift = { ...night, userId: 8, weekdays: 1 << 5 };
const fallback: RotaShift = { zoneId: null, userId: 9, weekdays: EVERY_DAY, startMinute: 0, endMinute: 0, isFallback: true };

describe("duty rota", () => {
  it("reads weekday and minute in the site's time zone", () => {
    // 2026-12-05T09:30Z is a Saturday; Chicago is UTC−6 in December: Saturday 03:30.
    expect(localWeekdayMinute(Date.parse("2026-12-05T09:30:00Z"), "America/Chicago")).toEqual({ weekday: 6, minute: 210 });
    expect(localWeekdayMinute(Date.parse("2026-12-05T09:30:00Z"), "UTC")).toEqual({ weekday: 6, minute: 570 });
  });

  it("a shift past midnight belongs to the day it started", () => {
    expect(shiftCovers(fridayNight, 5, 20 * 60)).toBe(true); // Friday 20:00
    expect(shiftCovers(fridayNight, 6, 3 * 60)).toBe(true); // Saturday 03:00, still Friday's night
    expect(shiftCovers(fridayNight, 6, 20 * 60)).toBe(false); // Saturday evening is not Friday's
    expect(shiftCovers(fridayNight, 5, 3 * 60)).toBe(false); // Friday 03:00 belongs to Thursday night
  });

  it("the end minute is not covered, the start is", () => {
    expect(shiftCovers(night, 1, 7 * 60)).toBe(false);
    expect(shiftCovers(night, 1, 18 * 60)).toBe(true);
  });

  it("falls back only when no shift covers the moment", () => {
    const shifts = [night, fallback];
    expect(usersOnDuty(shifts, 1, Date.parse("2026-12-05T03:00:00Z"), "UTC")).toEqual([7]);
    expect(usersOnDuty(shifts, 1, Date.parse("2026-12-05T12:00:00Z"), "UTC")).toEqual([9]);
  });

  it("a zone's own shifts and the every-zone shifts both count; other zones' do not", () => {
    const zone2Only: RotaShift = { ...night, zoneId: 2, userId: 11 };
    expect(usersOnDuty([night, zone2Only], 2, Date.parse("2026-12-05T03:00:00Z"), "UTC").sort((a, b) => a - b)).toEqual([7, 11]);
    expect(usersOnDuty([zone2Only], 1, Date.parse("2026-12-05T03:00:00Z"), "UTC")).toEqual([]);
  });
});

describe("shift words", () => {
  it("names the days (bit 0 = Sunday) Monday first, runs of three or more as a range", () => {
    expect(describeWeekdays(EVERY_DAY)).toBe("Every day");
    expect(describeWeekdays(0b0111110)).toBe("Mon–Fri");
    expect(describeWeekdays(0b1000001)).toBe("Sat, Sun");
    expect(describeWeekdays(0b0011101)).toBe("Tue–Thu, Sun");
    expect(describeWeekdays(0)).toBe("No days");
  });

  it("writes a minute of the day on a 24-hour clock, the end of the day as 24:00", () => {
    expect(clockTime(0)).toBe("00:00");
    expect(clockTime(22 * 60)).toBe("22:00");
    expect(clockTime(6 * 60 + 5)).toBe("06:05");
    expect(clockTime(1440)).toBe("24:00");
  });
});
