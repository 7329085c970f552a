import { describe, expect, it } from "vitest";
import { calibrate, isIdentity } from "./calibration.js";
import { readingsFromPayload } from "./sensor-readings.js";

const NOW_MS = Date.UTC(2026, 11, 3, 3, 0, 0);

describe("sensor calibration", () => {
  it("is linear: gain × measured + offset, per quantity; the battery and uncalibrated quantities pass through", () => {
    const calibration = { "medium.moisture": { offset: -0.03, gain: 1.2 }, "air.temperature": { offset: 0.5, gain: 1 } };
    expect(calibrate("medium.moisture", 0.4, calibration)).toBeCloseTo(0.45, 12);
    expect(calibrate("air.temperature", 20, calibration)).toBe(20.5);
    expect(calibrate("air.humidity", 70, calibration)).toBe(70);
    expect(calibrate("battery", 50, calibration)).toBe(50);
    expect(calibrate("air.temperature", 20, undefined)).toBe(20);
  });

  it("an offset of 0 with a gain of 1 is no calibration", () => {
    expect(isIdentity({ offset: 0, gain: 1 })).toBe(true);
    expect(isIdentity(undefined)).toBe(true);
    expect(isIdentity({ offset: 0, gain: 1.01 })).toBe(false);
  });

  it("is applied by readingsFromPayload after the unit conversion (K → °C) and the range check, and held inside the physical range", () => {
    const pack = JSON.stringify([
      { bt: NOW_MS / 1000, n: "air.temperature", u: "K", v: 295.15 },
      { n: "air.humidity", u: "%RH", v: 99 },
      { n: "medium.moisture", u: "/", v: 1.2 },
    ]);
    const result = readingsFromPayload(pack, { nowMs: NOW_MS, calibration: { "air.temperature": { offset: -1, gain: 1 }, "air.humidity": { offset: 2, gain: 1 } } });
    if (!result.ok) throw new Error(result.reason);
    expect(result.readings.find((r) => r.quantity === "air.temperature")?.value).toBeCloseTo(21, 10);
    expect(result.readings.find((r) => r.quantity === "air.humidity")?.value).toBe(100);
    // 1.2 m³/m³ measured is outside the probe's range: refused whatever the calibration.
    expect(result.rejected.map((r) => r.reason)).toEqual(["out-of-range"]);
  });
});
