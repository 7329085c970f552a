import { describe, expect, it } from "vitest";
import { fahrenheitToCelsius, fromDisplayValue } from "../domain/units.js";
import { benchWindowsInputSchema, quantityWindowSchema, zoneWindowsInputSchema, type QuantityWindow } from "./windows.js";

const AIR: QuantityWindow = { quantity: "air.temperature", min: 21.1, max: 26.7, delayS: 600, hysteresis: 0.5 };

/** The zod issues of a window, as "path: message". */
function issues(window: unknown): string[] {
  const result = quantityWindowSchema.safeParse(window);
  return result.success ? [] : result.error.issues.map((i) => `${i.path.join(".")}: ${i.message}`);
}

describe("the window schema (the one validation of client and server)", () => {
  it("accepts a window typed in °F and converted to stored units", () => {
    const typed = { min: 70, max: 80 };
    const window = { ...AIR, min: fromDisplayValue("air.temperature", typed.min, "F"), max: fromDisplayValue("air.temperature", typed.max, "F") };
    expect(quantityWindowSchema.parse(window).min).toBeCloseTo(fahrenheitToCelsius(70), 10);
  });

  it("refuses min ≥ max with the reason on both fields", () => {
    expect(issues({ ...AIR, min: 27, max: 21 })).toEqual(["min: The minimum must be below the maximum", "max: The maximum must be above the minimum"]);
    expect(issues({ ...AIR, min: 24, max: 24 })).toHaveLength(2);
  });

  it("refuses values outside the probes' physical range, naming it in both scales", () => {
    expect(issues({ ...AIR, min: -50 })).toEqual(["min: Air temperature probes read -40 to 85 °C (-40 to 185 °F); enter a value inside that range"]);
    expect(issues({ quantity: "medium.moisture", min: 0.3, max: 1.2, delayS: 0, hysteresis: 0 })[0]).toMatch(/^max: .*0 to 100 % VWC/);
    expect(issues({ quantity: "air.humidity", min: -1, max: 90, delayS: 0, hysteresis: 0 })[0]).toMatch(/^min: .*0 to 100 % RH/);
  });

  it("takes a delay of whole seconds from 0 to 24 h", () => {
    expect(issues({ ...AIR, delayS: -1 })).toEqual(["delayS: The delay cannot be negative"]);
    expect(issues({ ...AIR, delayS: 24 * 3600 + 1 })).toEqual(["delayS: Use a delay of at most 24 hours"]);
    expect(issues({ ...AIR, delayS: 1.5 })).toEqual(["delayS: Use whole seconds"]);
    expect(issues({ ...AIR, delayS: 24 * 3600 })).toEqual([]);
  });

  it("takes a clearing band from 0 up to, not including, the window's width", () => {
    expect(issues({ ...AIR, hysteresis: -0.1 })).toEqual(["hysteresis: The clearing band cannot be negative"]);
    expect(issues({ ...AIR, hysteresis: 5.6 })).toEqual(["hysteresis: The clearing band must be narrower than the window (maximum − minimum)"]);
    expect(issues({ ...AIR, hysteresis: 0 })).toEqual([]);
  });

  it("refuses battery (not a windowed quantity), text and missing numbers", () => {
    expect(issues({ ...AIR, quantity: "battery" })[0]).toMatch(/^quantity:/);
    expect(issues({ ...AIR, min: "21" })).toEqual(["min: Enter a number"]);
    expect(issues({ ...AIR, max: undefined })).toEqual(["max: Enter a number"]);
  });

  it("a zone set lists each quantity once and takes a margin of 0–10 °C", () => {
    const twice = zoneWindowsInputSchema.safeParse({ windows: [AIR, AIR], dewPointMarginC: 2 });
    expect(twice.error?.issues.map((i) => `${i.path.join(".")}: ${i.message}`)).toEqual(["windows.1.quantity: Air temperature appears twice"]);
    expect(zoneWindowsInputSchema.safeParse({ windows: [AIR], dewPointMarginC: 11 }).error?.issues[0]?.path).toEqual(["dewPointMarginC"]);
    expect(zoneWindowsInputSchema.safeParse({ windows: [], dewPointMarginC: 0 }).success).toBe(true);
  });

  it("field errors of a set carry the window's index, e.g. windows.0.min", () => {
    const result = zoneWindowsInputSchema.safeParse({ windows: [{ ...AIR, min: 30 }], dewPointMarginC: 2 });
    expect(result.error?.issues.map((i) => i.path.join("."))).toEqual(["windows.0.min", "windows.0.max"]);
  });

  it("bench overrides may leave the margin to the zone (null)", () => {
    expect(benchWindowsInputSchema.parse({ windows: [], dewPointMarginC: null })).toEqual({ windows: [], dewPointMarginC: null });
  });
});
