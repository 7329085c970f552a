import { describe, it, expect } from "vitest";
import fc from "fast-check";
import psychrolib from "psychrolib";
import {
  actualVapourPressureKPa,
  dewPointC,
  dewPointMarginC,
  isCondensationRisk,
  meanSaturationVapourPressureKPa,
  relativeHumidityFromDewPointPct,
  saturationVapourPressureKPa,
  vapourPressureDeficitKPa,
} from "./psychrometrics.js";

psychrolib.SetUnitSystem(psychrolib.SI);

/** |a − b| ≤ tolerance, with a readable failure. */
function expectWithin(actual: number | undefined, expected: number, tolerance: number): void {
  expect(actual).toBeDefined();
  expect(Math.abs((actual as number) - expected), `${actual} vs ${expected} ± ${tolerance}`).toBeLessThanOrEqual(tolerance);
}

/** The range the probes report (issue 3 item 3). */
const probeT = fc.double({ min: -10, max: 50, noNaN: true });
const probeRh = fc.double({ min: 1, max: 100, noNaN: true });

describe("saturation vapour pressure — FAO-56 (Allen et al. 1998) eq. 11", () => {
  // FAO-56 Annex 2 table of e°(T) (table number from memory, verify); 15 and 25 °C are also printed
  // in the chapter-3 worked examples. Tolerance ±0.0005 kPa against three decimals (REFERENCES.md §1).
  const annex2: [number, number][] = [
    [10, 1.228],
    [15, 1.705],
    [20, 2.338],
    [25, 3.168],
    [30, 4.243],
  ];
  for (const [tC, eKPa] of annex2) {
    it(`e°(${tC} °C) = ${eKPa} kPa (FAO-56 eq. 11, Annex 2 table)`, () => {
      expectWithin(saturationVapourPressureKPa(tC), eKPa, 0.0005);
    });
  }

  it("worked example 3: Tmax 24.5 °C, Tmin 15 °C → es = 2.39 kPa (FAO-56 ch. 3 example 3, eq. 12)", () => {
    expectWithin(meanSaturationVapourPressureKPa(24.5, 15), 2.39, 0.005);
  });

  it("eq. 12 refuses Tmax below Tmin", () => {
    expect(meanSaturationVapourPressureKPa(15, 24.5)).toBeUndefined();
  });

  it("agrees with the ASHRAE Handbook—Fundamentals (2017) method in psychrolib within 0.5 % over 0.1…50 °C (computed comparison)", () => {
    fc.assert(
      fc.property(fc.double({ min: 0.1, max: 50, noNaN: true }), (tC) => {
        const ashraeKPa = psychrolib.GetSatVapPres(tC) / 1000;
        const faoKPa = saturationVapourPressureKPa(tC) as number;
        return Math.abs(faoKPa - ashraeKPa) / ashraeKPa <= 0.005;
      }),
    );
  });

  it("refuses non-finite and out-of-range temperatures rather than returning NaN", () => {
    for (const tC of [Number.NaN, Number.POSITIVE_INFINITY, -237.3, -41, 86]) expect(saturationVapourPressureKPa(tC)).toBeUndefined();
  });
});

describe("actual vapour pressure and VPD — FAO-56 eqs. 10–11", () => {
  it("ea = e°(T)·RH/100: 25 °C, 80 %RH → 2.534 kPa (FAO-56 eq. 10 with the Annex 2 value 3.168 kPa; computed)", () => {
    expectWithin(actualVapourPressureKPa(25, 80), 3.168 * 0.8, 0.0005);
  });

  it("VPD = e°(T)·(1 − RH/100): 25 °C, 80 %RH → 0.634 kPa (FAO-56 eqs. 10–11 with Annex 2 value; computed)", () => {
    expectWithin(vapourPressureDeficitKPa(25, 80), 3.168 * 0.2, 0.0005);
  });

  it("VPD is 0 at 100 %RH and e°(T) at 0 %RH (FAO-56 eqs. 10–11)", () => {
    expect(vapourPressureDeficitKPa(20, 100)).toBe(0);
    expect(vapourPressureDeficitKPa(20, 0)).toBe(saturationVapourPressureKPa(20));
  });

  it("a rooting-friendly 0.6–0.85 kPa band is reachable in the 21–27 °C air band (LeBude et al. 2005, HortScience 40(5); PRODUCT.md §1 band, common practice)", () => {
    // 24 °C at 75 %RH: e°(24) ≈ 2.985 kPa → VPD ≈ 0.746 kPa.
    const vpd = vapourPressureDeficitKPa(24, 75) as number;
    expect(vpd).toBeGreaterThan(0.6);
    expect(vpd).toBeLessThan(0.85);
  });

  it("agrees with psychrolib's vapour pressure (ASHRAE 2017) within 0.5 % over 0.1…50 °C (computed comparison)", () => {
    fc.assert(
      fc.property(fc.double({ min: 0.1, max: 50, noNaN: true }), fc.double({ min: 1, max: 100, noNaN: true }), (tC, rh) => {
        const ashraeKPa = psychrolib.GetVapPresFromRelHum(tC, rh / 100) / 1000;
        return Math.abs((actualVapourPressureKPa(tC, rh) as number) - ashraeKPa) <= 0.005 * ashraeKPa;
      }),
    );
  });

  it("RH below 0 or above 100 is refused, not NaN (issue 3 item 3)", () => {
    for (const rh of [-0.1, 100.1, Number.NaN]) {
      expect(vapourPressureDeficitKPa(20, rh)).toBeUndefined();
      expect(actualVapourPressureKPa(20, rh)).toBeUndefined();
    }
  });
});

describe("dew point — Magnus form, Alduchov & Eskridge (1996) coefficients", () => {
  it("25 °C, 80 %RH → 21.3094 °C ± 0.1 (PsychroLib documentation, ASHRAE Handbook—Fundamentals 2017 method; REFERENCES.md §2)", () => {
    expectWithin(dewPointC(25, 80), 21.3094, 0.1);
  });

  it("15.56 °C, 47 %RH → 4.3 °C ± 0.1 (a NWS-style dew-point formula, secondary source; REFERENCES.md §2)", () => {
    expectWithin(dewPointC(15.56, 47), 4.3, 0.1);
  });

  it("matches psychrolib (ASHRAE 2017) within 0.1 °C over 10…50 °C, 10…100 %RH, dew point above 0.5 °C (REFERENCES.md §2 tolerance)", () => {
    fc.assert(
      fc.property(fc.double({ min: 10, max: 50, noNaN: true }), fc.double({ min: 10, max: 100, noNaN: true }), (tC, rh) => {
        const tdC = dewPointC(tC, rh) as number;
        fc.pre(tdC > 0.5); // psychrolib gives the frost point below 0 °C
        return Math.abs(tdC - psychrolib.GetTDewPointFromRelHum(tC, rh / 100)) <= 0.1;
      }),
    );
  });

  it("Lawrence (2005) rule of thumb Td ≈ T − (100 − RH)/5 holds to about 1 °C for RH above 50 % (BAMS 86:225; checked over 5…30 °C, 60…100 %RH)", () => {
    fc.assert(
      fc.property(fc.double({ min: 5, max: 30, noNaN: true }), fc.double({ min: 60, max: 100, noNaN: true }), (tC, rh) => {
        return Math.abs((dewPointC(tC, rh) as number) - (tC - (100 - rh) / 5)) <= 1;
      }),
    );
  });

  it("at 100 %RH the dew point is the air temperature", () => {
    for (const tC of [-10, 0, 21.5, 50]) expect(dewPointC(tC, 100)).toBeCloseTo(tC, 10);
  });

  it("RH 0 or above 100 is refused, not NaN or −Infinity (issue 3 item 3)", () => {
    for (const rh of [0, -5, 100.0001, Number.NaN]) expect(dewPointC(20, rh)).toBeUndefined();
    expect(dewPointC(Number.NaN, 50)).toBeUndefined();
  });

  it("the probe-range edges give finite dew points: −10 °C/1 %RH, 50 °C/1 %RH, −10 °C/100 %RH, 50 °C/100 %RH", () => {
    for (const [tC, rh] of [
      [-10, 1],
      [50, 1],
      [-10, 100],
      [50, 100],
    ] as const) {
      expect(Number.isFinite(dewPointC(tC, rh))).toBe(true);
    }
  });

  it("FAO-56 eq. 14 consistency: e°(Td) ≈ ea = e°(T)·RH/100 within 1 % over 0…50 °C, 20…100 %RH (two fits of one curve; computed)", () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 50, noNaN: true }), fc.double({ min: 20, max: 100, noNaN: true }), (tC, rh) => {
        const ea = actualVapourPressureKPa(tC, rh) as number;
        const viaDewPoint = saturationVapourPressureKPa(dewPointC(tC, rh) as number) as number;
        return Math.abs(viaDewPoint - ea) <= 0.01 * ea;
      }),
    );
  });
});

describe("condensation risk (REFERENCES.md §2: OSU Extension AEX-804-01; 1–2 °C margin is common practice)", () => {
  it("air near saturation is a risk, dry air is not", () => {
    expect(isCondensationRisk(18, 95)).toBe(true); // Td ≈ 17.2 °C, margin ≈ 0.8 °C
    expect(isCondensationRisk(24, 70)).toBe(false); // Td ≈ 18.2 °C, margin ≈ 5.8 °C
    expect(isCondensationRisk(24, 70, 6)).toBe(true);
    expect(isCondensationRisk(24, 0)).toBeUndefined();
  });

  it("margin = T − Td", () => {
    expectWithin(dewPointMarginC(25, 80), 25 - 21.3094, 0.1);
  });
});

describe("psychrometric properties over the probe range −10…50 °C, 1…100 %RH (fast-check; issue 3 item 7)", () => {
  it("every function is defined and finite across the range", () => {
    fc.assert(
      fc.property(probeT, probeRh, (tC, rh) =>
        [saturationVapourPressureKPa(tC), actualVapourPressureKPa(tC, rh), vapourPressureDeficitKPa(tC, rh), dewPointC(tC, rh)].every(
          (x) => x !== undefined && Number.isFinite(x),
        ),
      ),
    );
  });

  it("dew point ≤ air temperature", () => {
    fc.assert(fc.property(probeT, probeRh, (tC, rh) => (dewPointC(tC, rh) as number) <= tC));
  });

  it("VPD ≥ 0, and 0 at 100 %RH", () => {
    fc.assert(fc.property(probeT, probeRh, (tC, rh) => (vapourPressureDeficitKPa(tC, rh) as number) >= 0));
    fc.assert(fc.property(probeT, (tC) => vapourPressureDeficitKPa(tC, 100) === 0));
  });

  it("ea + VPD = e°(T) (FAO-56 eqs. 10–11)", () => {
    fc.assert(
      fc.property(probeT, probeRh, (tC, rh) => {
        const sum = (actualVapourPressureKPa(tC, rh) as number) + (vapourPressureDeficitKPa(tC, rh) as number);
        return Math.abs(sum - (saturationVapourPressureKPa(tC) as number)) <= 1e-12;
      }),
    );
  });

  it("dew point rises with RH and with T; e° rises with T", () => {
    // Two inputs a few ulps apart can round to outputs in the wrong order
    // (seen at 49.99999999999991 vs 49.999999999999915 °C); monotonic means
    // "never falls by more than rounding", far below any probe's resolution.
    const ROUNDING_SLACK = 1e-12;
    fc.assert(
      fc.property(probeT, probeRh, probeRh, (tC, a, b) => {
        const [lo, hi] = a <= b ? [a, b] : [b, a];
        return (dewPointC(tC, lo) as number) <= (dewPointC(tC, hi) as number) + ROUNDING_SLACK;
      }),
    );
    fc.assert(
      fc.property(probeT, probeT, (a, b) => {
        const [lo, hi] = a <= b ? [a, b] : [b, a];
        return (saturationVapourPressureKPa(lo) as number) <= (saturationVapourPressureKPa(hi) as number) + ROUNDING_SLACK;
      }),
    );
  });

  it("RH → dew point → RH round-trips within 1e-6 %RH", () => {
    fc.assert(
      fc.property(probeT, probeRh, (tC, rh) => {
        const back = relativeHumidityFromDewPointPct(tC, dewPointC(tC, rh) as number) as number;
        return Math.abs(back - rh) <= 1e-6;
      }),
    );
  });
});
