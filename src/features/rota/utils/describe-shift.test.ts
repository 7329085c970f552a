import { describe, expect, it } from "vitest";
import { describeHours, describeWeekdays, minuteFromTimeInput, timeInputFromMinute } from "./describe-shift";

describe("describe-shift", () => {
  it("names the days of a shift (bit 0 = Sunday) in plain words, Monday first", () => {
    expect(describeWeekdays(0b1111111)).toBe("Every day");
    expect(describeWeekdays(0b0111110)).toBe("Mon–Fri");
    expect(describeWeekdays(0b1000001)).toBe("Sat, Sun");
    expect(describeWeekdays(0b0101010)).toBe("Mon, Wed, Fri");
    expect(describeWeekdays(0b0011101)).toBe("Tue–Thu, Sun");
  });

  it("says all day, a day shift, and a night shift that ends the next day", () => {
    expect(describeHours({ startMinute: 0, endMinute: 1440 })).toBe("All day");
    expect(describeHours({ startMinute: 0, endMinute: 0 })).toBe("All day");
    expect(describeHours({ startMinute: 8 * 60, endMinute: 17 * 60 })).toMatch(/^8:00\sAM – 5:00\sPM$/);
    expect(describeHours({ startMinute: 18 * 60, endMinute: 7 * 60 })).toMatch(/next day$/);
    expect(describeHours({ startMinute: 18 * 60, endMinute: 0 })).toMatch(/– midnight$/);
  });

  it("reads and writes time inputs", () => {
    expect(minuteFromTimeInput("18:30")).toBe(1110);
    expect(minuteFromTimeInput("")).toBeUndefined();
    expect(minuteFromTimeInput("25:00")).toBeUndefined();
    expect(timeInputFromMinute(1110)).toBe("18:30");
    expect(timeInputFromMinute(1440)).toBe("00:00");
  });
});
