import { describe, it, expect } from "vitest";
import fc from "fast-check";
import { QUANTITIES, STORED_UNIT } from "../schemas/quantities.js";
import {
  ACCEPTED_SENML_UNITS,
  celsiusDeltaToFahrenheit,
  celsiusToFahrenheit,
  celsiusToKelvin,
  displayDecimals,
  displayUnit,
  fahrenheitDeltaToCelsius,
  fahrenheitToCelsius,
  formatQuantity,
  fromDisplayValue,
  isAcceptedUnit,
  isTemperature,
  kelvinToCelsius,
  roundForDisplay,
  toDisplayValue,
  toStoredValue,
} from "./units.js";

describe("temperature conversion — NIST SP 811 (2008), appendix B reference points", () => {
  it("−40 °C = −40 °F (NIST SP 811 appendix B; REFERENCES.md §4)", () => {
    expect(celsiusToFahrenheit(-40)).toBe(-40);
    expect(fahrenheitToCelsius(-40)).toBe(-40);
  });

  it("0 °C = 32 °F = 273.15 K (NIST SP 811 appendix B; REFERENCES.md §4)", () => {
    expect(celsiusToFahrenheit(0)).toBe(32);
    expect(fahrenheitToCelsius(32)).toBe(0);
    expect(celsiusToKelvin(0)).toBe(273.15);
    expect(kelvinToCelsius(273.15)).toBe(0);
  });

  it("100 °C = 212 °F (NIST SP 811 appendix B; REFERENCES.md §4)", () => {
    expect(celsiusToFahrenheit(100)).toBe(212);
    expect(fahrenheitToCelsius(212)).toBe(100);
  });

  it("the rooting band 70–80 °F is about 21.1–26.7 °C (PRODUCT.md §1, common practice band)", () => {
    expect(fahrenheitToCelsius(70)).toBeCloseTo(21.111, 3);
    expect(fahrenheitToCelsius(80)).toBeCloseTo(26.667, 3);
  });

  it("a temperature difference converts without the 32: 1 °C = 1.8 °F (NIST SP 811 appendix B; REFERENCES.md §4)", () => {
    expect(celsiusDeltaToFahrenheit(1)).toBe(1.8);
    expect(fahrenheitDeltaToCelsius(1.8)).toBe(1);
  });
});

describe("accepted SenML units (PRODUCT.md §4, RFC 8428 §12.1)", () => {
  it("the first accepted unit is the stored unit of each quantity", () => {
    for (const quantity of QUANTITIES) expect(ACCEPTED_SENML_UNITS[quantity][0]).toBe(STORED_UNIT[quantity]);
  });

  it("temperatures take Cel or K; humidity %RH; moisture /; battery %EL; a missing unit never", () => {
    expect(isAcceptedUnit("air.temperature", "Cel")).toBe(true);
    expect(isAcceptedUnit("medium.temperature", "K")).toBe(true);
    expect(isAcceptedUnit("air.temperature", "degF")).toBe(false);
    expect(isAcceptedUnit("air.temperature", "cel")).toBe(false); // RFC 8428 §12.1 symbols are case-sensitive
    expect(isAcceptedUnit("air.humidity", "%RH")).toBe(true);
    expect(isAcceptedUnit("air.humidity", "%")).toBe(false);
    expect(isAcceptedUnit("medium.moisture", "/")).toBe(true);
    expect(isAcceptedUnit("medium.moisture", "%")).toBe(false);
    expect(isAcceptedUnit("battery", "%EL")).toBe(true);
    expect(isAcceptedUnit("battery", undefined)).toBe(false);
  });

  it("K is converted to Cel on the way in: 294.15 K → 21 °C (NIST SP 811: T/K = t/°C + 273.15)", () => {
    expect(toStoredValue("air.temperature", 294.15, "K")).toBeCloseTo(21, 10);
    expect(toStoredValue("air.temperature", 21, "Cel")).toBe(21);
    expect(toStoredValue("medium.moisture", 0.41, "/")).toBe(0.41);
    expect(toStoredValue("air.humidity", 80, "Cel")).toBeUndefined();
    expect(toStoredValue("air.humidity", 80, undefined)).toBeUndefined();
  });
});

describe("display (issue 3 item 2: one decimal for temperatures, whole percent for humidity)", () => {
  it("decimals per quantity", () => {
    expect(displayDecimals("air.temperature")).toBe(1);
    expect(displayDecimals("medium.temperature")).toBe(1);
    expect(displayDecimals("air.humidity")).toBe(0);
    expect(displayDecimals("medium.moisture")).toBe(0);
    expect(displayDecimals("battery")).toBe(0);
  });

  it("moisture is stored as a ratio and shown as % VWC (REFERENCES.md §5: no VWC unit in SenML)", () => {
    expect(toDisplayValue("medium.moisture", 0.41, "C")).toBeCloseTo(41, 10);
    expect(fromDisplayValue("medium.moisture", 41, "C")).toBeCloseTo(0.41, 10);
    expect(displayUnit("medium.moisture", "C")).toBe("% VWC");
  });

  it("formats with unit labels, and never shows −0.0", () => {
    expect(formatQuantity("air.temperature", 24, "F")).toBe("75.2 °F");
    expect(formatQuantity("air.temperature", 24, "C")).toBe("24.0 °C");
    expect(formatQuantity("air.humidity", 81.6, "C")).toBe("82 % RH");
    expect(formatQuantity("medium.temperature", -0.01, "C")).toBe("0.0 °C");
    expect(formatQuantity("battery", 97, "F")).toBe("97 %");
  });

  it("roundForDisplay gives the number formatQuantity prints", () => {
    expect(roundForDisplay("air.temperature", 24, "F")).toBe(75.2);
    expect(roundForDisplay("air.humidity", 81.6, "C")).toBe(82);
    expect(Object.is(roundForDisplay("air.temperature", -0.01, "C"), 0)).toBe(true);
    expect(roundForDisplay("medium.moisture", 0.414, "C")).toBe(41);
  });

  it("only the two temperatures are temperatures", () => {
    expect(QUANTITIES.filter(isTemperature)).toEqual(["air.temperature", "medium.temperature"]);
  });
});

describe("conversion properties (fast-check; issue 3 item 7: conversions round-trip)", () => {
  const celsius = fc.double({ min: -100, max: 200, noNaN: true });

  it("°C → °F → °C round-trips within 1e-9 °C", () => {
    fc.assert(fc.property(celsius, (tC) => Math.abs(fahrenheitToCelsius(celsiusToFahrenheit(tC)) - tC) <= 1e-9));
  });

  it("°C → K → °C round-trips within 1e-9 °C", () => {
    fc.assert(fc.property(celsius, (tC) => Math.abs(kelvinToCelsius(celsiusToKelvin(tC)) - tC) <= 1e-9));
  });

  it("differences: a delta converts like the difference of two temperatures (NIST SP 811 appendix B)", () => {
    fc.assert(
      fc.property(celsius, celsius, (a, b) => {
        const viaPoints = celsiusToFahrenheit(a) - celsiusToFahrenheit(b);
        return Math.abs(celsiusDeltaToFahrenheit(a - b) - viaPoints) <= 1e-9;
      }),
    );
  });

  it("toDisplayValue and fromDisplayValue are inverse for every quantity and scale", () => {
    fc.assert(
      fc.property(fc.constantFrom(...QUANTITIES), fc.constantFrom("C" as const, "F" as const), fc.double({ min: -50, max: 150, noNaN: true }), (q, unit, v) => {
        return Math.abs(fromDisplayValue(q, toDisplayValue(q, v, unit), unit) - v) <= 1e-9;
      }),
    );
  });

  it("a formatted value never reads as negative zero", () => {
    fc.assert(
      fc.property(fc.constantFrom(...QUANTITIES), fc.double({ min: -0.049, max: 0.049, noNaN: true }), (q, v) => {
        return !formatQuantity(q, v, "C").startsWith("-0 ") && !formatQuantity(q, v, "C").startsWith("-0.0 ");
      }),
    );
  });
});
