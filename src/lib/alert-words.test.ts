import { describe, expect, it } from "vitest";
import { makeAlert } from "../testing/data";
import { describeAlertPhase, formatAlertValue, formatAlertWindow, formatTemperatureDifference } from "./alert-words";

describe("alert words", () => {
  it("shows a dew-point margin as a temperature difference: °F = °C × 1.8 with no offset (NIST SP 811 appendix B: a temperature interval of 1 °F is 5/9 K)", () => {
    const condensation = makeAlert({ kind: "condensation", quantity: null, direction: null });
    expect(formatAlertValue(condensation, 1, "F")).toBe("1.8 °F above the dew point");
    expect(formatAlertValue(condensation, 1, "C")).toBe("1.0 °C above the dew point");
    expect(formatAlertValue(condensation, 0.25, "F")).toBe("0.5 °F above the dew point");
    expect(formatTemperatureDifference(-0.01, "F")).toBe("0.0 °F");
  });

  it("shows a window alert's value and window in the user's unit, and a silent sensor's as nothing", () => {
    const cold = makeAlert({ lastValue: 15, windowMin: 21, windowMax: 27 });
    expect(formatAlertValue(cold, 15, "F")).toBe("59.0 °F");
    expect(formatAlertWindow(cold, "C")).toBe("21.0–27.0 °C");
    const wet = makeAlert({ quantity: "medium.moisture", direction: "above", windowMin: 0.25, windowMax: 0.45 });
    expect(formatAlertValue(wet, 0.6, "F")).toBe("60 % VWC");
    expect(formatAlertWindow(wet, "F")).toBe("25–45 % VWC");
    const silent = makeAlert({ kind: "sensor-silent", quantity: null, direction: null, sensorId: "h1-b1-air", lastValue: null });
    expect(formatAlertValue(silent, silent.lastValue, "F")).toBeNull();
    expect(formatAlertWindow(silent, "F")).toBeNull();
  });

  it("says each phase in the card's words", () => {
    expect(describeAlertPhase(makeAlert({ phase: "watching" }))).toBe("Watching: hold-off running");
    expect(describeAlertPhase(makeAlert({ phase: "raised" }))).toMatch(/^Raised \d/);
    expect(describeAlertPhase(makeAlert({ phase: "acknowledged", acknowledgedByName: "Marisol" }))).toBe("Acknowledged by Marisol");
  });
});
