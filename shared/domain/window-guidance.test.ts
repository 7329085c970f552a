import psychrolib from "psychrolib";
import { describe, expect, it } from "vitest";
import { zoneWindowsInputSchema, type QuantityWindow, type WindowWarning } from "../schemas/windows.js";
import { fahrenheitToCelsius } from "./units.js";
import { BUILT_IN_PRESETS, GUIDANCE, bothScales, condensationOnsetRhPct, windowWarnings } from "./window-guidance.js";

psychrolib.SetUnitSystem(psychrolib.SI);

/** A window set with nothing to warn about; each test changes one value. */
const QUIET: QuantityWindow[] = [
  { quantity: "air.temperature", min: 21.1, max: 26.7, delayS: 600, hysteresis: 0.5 },
  { quantity: "air.humidity", min: 65, max: 85, delayS: 1800, hysteresis: 3 },
  { quantity: "medium.temperature", min: 21, max: 25, delayS: 900, hysteresis: 0.5 },
  { quantity: "medium.moisture", min: 0.35, max: 0.55, delayS: 3600, hysteresis: 0.02 },
];

function warningsWith(change: Partial<QuantityWindow> & Pick<QuantityWindow, "quantity">, marginC = 2): WindowWarning[] {
  return windowWarnings({ windows: QUIET.map((w) => (w.quantity === change.quantity ? { ...w, ...change } : w)), dewPointMarginC: marginC });
}

const codes = (warnings: WindowWarning[]) => warnings.map((w) => w.code);

describe("window guidance warnings", () => {
  it("a window inside common guidance gives no warning", () => {
    expect(windowWarnings({ windows: QUIET, dewPointMarginC: 2 })).toEqual([]);
  });

  // Common practice (REFERENCES.md §6): air 70–80 °F (21–27 °C); little rooting below about 70 °F.
  it("an air minimum below about 70 °F (21 °C) warns that rooting slows, citing common practice §6", () => {
    const [w] = warningsWith({ quantity: "air.temperature", min: fahrenheitToCelsius(68) });
    expect(w).toMatchObject({ code: "air-min-below-rooting", quantity: "air.temperature", field: "min", threshold: 21 });
    expect(w!.message).toContain("70 °F (21 °C)");
    expect(w!.message).toMatch(/rooting slows sharply/);
    expect(w!.source).toMatchObject({ basis: "common-practice", reference: "REFERENCES.md §6" });
  });

  it("70 °F entered exactly (21.11 °C), and 21.1 °C, do not warn", () => {
    expect(codes(warningsWith({ quantity: "air.temperature", min: fahrenheitToCelsius(70) }))).toEqual([]);
    expect(codes(warningsWith({ quantity: "air.temperature", min: 21.1 }))).toEqual([]);
  });

  // Acquaah, Horticulture: Principles and Practices, ch. 10 [S]: air 18–27 °C.
  it("an air maximum above 27 °C warns, citing Acquaah ch. 10 (published)", () => {
    const [w] = warningsWith({ quantity: "air.temperature", max: 29 });
    expect(w).toMatchObject({ code: "air-max-above-rooting", field: "max", threshold: 27 });
    expect(w!.source.basis).toBe("published");
    expect(w!.source.citation).toContain("Acquaah");
  });

  // Furuta, UC Leaflet 2560 [S]: medium at 18–24 °C; a cold medium delays or stops rooting.
  it("a medium minimum below 18 °C warns, citing Furuta (UC Leaflet 2560)", () => {
    const [w] = warningsWith({ quantity: "medium.temperature", min: 16 });
    expect(w).toMatchObject({ code: "medium-min-below-rooting", field: "min", threshold: 18 });
    expect(w!.source.citation).toContain("Leaflet 2560");
  });

  // Common practice (REFERENCES.md §6 defaults): flag a medium above 30 °C.
  it("a medium maximum above 30 °C (86 °F) warns, common practice §6", () => {
    const [w] = warningsWith({ quantity: "medium.temperature", max: 32 });
    expect(w).toMatchObject({ code: "medium-max-above-rooting", field: "max", threshold: 30 });
    expect(w!.message).toContain("86 °F (30 °C)");
    expect(w!.source).toMatchObject({ basis: "common-practice", reference: "REFERENCES.md §6" });
  });

  // Common practice (REFERENCES.md §7): above about 0.55 m³/m³ saturated (rot risk); below about 0.20 dry.
  it("moisture above 55 % VWC warns of rot, below 20 % VWC of a dry medium, common practice §7", () => {
    const [wet] = warningsWith({ quantity: "medium.moisture", max: 0.62 });
    expect(wet).toMatchObject({ code: "moisture-max-saturated", field: "max", threshold: 0.55 });
    expect(wet!.message).toMatch(/rot/);
    expect(wet!.source.reference).toBe("REFERENCES.md §7");
    const [dry] = warningsWith({ quantity: "medium.moisture", min: 0.15 });
    expect(dry).toMatchObject({ code: "moisture-min-dry", field: "min", threshold: 0.2 });
  });

  it("the limits themselves do not warn (0.55 and 0.20 are inside the guidance)", () => {
    expect(codes(warningsWith({ quantity: "medium.moisture", min: 0.2, max: 0.55 }))).toEqual([]);
  });

  // Common practice: one cold night can cost a batch, so a hold-off over 2 h is long.
  it("a hold-off over 2 hours warns; none at all warns that one reading raises an alert", () => {
    const [long] = warningsWith({ quantity: "air.temperature", delayS: 3 * 3600 });
    expect(long).toMatchObject({ code: "delay-long", field: "delayS", threshold: GUIDANCE.longDelayS });
    expect(long!.source.basis).toBe("common-practice");
    const [none] = warningsWith({ quantity: "air.humidity", delayS: 0 });
    expect(none).toMatchObject({ code: "delay-none", quantity: "air.humidity", field: "delayS" });
    expect(none!.source).toMatchObject({ basis: "benchwarden", reference: "shared/domain/window-evaluation.ts" });
  });

  // Benchwarden's engine caps the clearing band at half the window (clearingThresholds).
  it("a clearing band over half the window warns that it is capped; none warns of flapping", () => {
    const [capped] = warningsWith({ quantity: "medium.temperature", hysteresis: 2.5 });
    expect(capped).toMatchObject({ code: "hysteresis-capped", field: "hysteresis", threshold: 2 });
    const [none] = warningsWith({ quantity: "medium.temperature", hysteresis: 0 });
    expect(none).toMatchObject({ code: "hysteresis-none", field: "hysteresis" });
  });

  // Common practice (REFERENCES.md §2): an alarm margin of 1–2 °C between air and dew point.
  it("a dew-point margin under 1 °C warns, common practice §2", () => {
    const warnings = windowWarnings({ windows: QUIET, dewPointMarginC: 0.5 });
    expect(warnings.at(-1)).toMatchObject({ code: "dew-point-margin-small", quantity: null, field: "dewPointMarginC", threshold: 1 });
    expect(warnings.at(-1)!.source.reference).toBe("REFERENCES.md §2");
  });

  it("a humidity maximum above where the dew-point margin is crossed at the air minimum warns of condensation alerts", () => {
    // 95 % RH at 21.1 °C is within 2 °C of its dew point.
    const [w] = warningsWith({ quantity: "air.humidity", max: 95 });
    expect(w).toMatchObject({ code: "humidity-max-meets-condensation", quantity: "air.humidity", field: "max" });
    expect(w!.message).toContain("88 % RH");
    expect(w!.threshold).toBeCloseTo(condensationOnsetRhPct(21.1, 2)!, 10);
  });

  it("warnings come in quantity order with the margin last", () => {
    // (An 85 % RH maximum stays clear of a 0.5 °C margin at 21.1 °C, so no humidity–margin warning.)
    const warnings = windowWarnings({
      windows: QUIET.map((w) => ({ ...w, delayS: 0 })),
      dewPointMarginC: 0.5,
    });
    expect(warnings.map((w) => w.quantity)).toEqual(["air.temperature", "air.humidity", "medium.temperature", "medium.moisture", null]);
  });
});

describe("condensation onset", () => {
  // RH at which T − Td = margin: e°(T − m)/e°(T). Checked against the ASHRAE Handbook—Fundamentals
  // (2017) saturation pressure through PsychroLib; Magnus and ASHRAE agree within about 0.02 °C of
  // dew point for RH ≥ 50 % (REFERENCES.md §2), i.e. well within 0.3 % RH here.
  for (const [tC, marginC] of [
    [21.1, 2],
    [25, 1],
    [18, 1.5],
  ] as const) {
    it(`at ${tC} °C a ${marginC} °C margin starts at e°(T − m)/e°(T) (PsychroLib, ASHRAE 2017)`, () => {
      const ashrae = (100 * psychrolib.GetSatVapPres(tC - marginC)) / psychrolib.GetSatVapPres(tC);
      expect(Math.abs(condensationOnsetRhPct(tC, marginC)! - ashrae)).toBeLessThan(0.3);
    });
  }

  // Lawrence (2005), BAMS 86:225: Td ≈ T − (100 − RH)/5 for RH above 50 %, good to about 1 °C,
  // so a 2 °C margin starts near 90 % RH (±5 % RH for the rule's 1 °C).
  it("a 2 °C margin starts near 90 % RH, as Lawrence's (2005) rule of thumb gives", () => {
    expect(Math.abs(condensationOnsetRhPct(21.1, 2)! - 90)).toBeLessThan(5);
  });
});

describe("both scales", () => {
  // NIST SP 811 appendix B: t/°F = 1.8 · t/°C + 32.
  it("names °F and °C, whole degrees where they are whole", () => {
    expect(bothScales(21)).toBe("69.8 °F (21 °C)");
    expect(bothScales(30)).toBe("86 °F (30 °C)");
    expect(bothScales(fahrenheitToCelsius(70))).toBe("70 °F (21.1 °C)");
  });
});

describe("built-in presets", () => {
  it("ships three presets of our own, each a valid window set with a noted source for every value", () => {
    expect(BUILT_IN_PRESETS.map((p) => p.id)).toEqual(["warm-rooting", "graft-callusing", "hardening-off"]);
    for (const preset of BUILT_IN_PRESETS) {
      expect(() => zoneWindowsInputSchema.parse({ windows: preset.windows, dewPointMarginC: preset.dewPointMarginC })).not.toThrow();
      expect(preset.windows.map((w) => w.quantity)).toEqual(["air.temperature", "air.humidity", "medium.temperature", "medium.moisture"]);
      expect(preset.notes.map((n) => n.quantity)).toEqual(["air.temperature", "air.humidity", "medium.temperature", "medium.moisture", null]);
      for (const n of preset.notes) expect(n.source.basis === "published" || /common practice/i.test(n.source.citation)).toBe(true);
    }
  });

  // Warm rooting: air 70–80 °F and medium 21–25 °C (REFERENCES.md §6), moisture 0.35–0.55 (§7), margin 2 °C (§2).
  it("warm rooting holds the common-practice rooting values and raises no warning", () => {
    const warm = BUILT_IN_PRESETS[0]!;
    expect(warm.windows[0]!.min).toBeCloseTo(fahrenheitToCelsius(70), 10);
    expect(warm.windows[0]!.max).toBeCloseTo(fahrenheitToCelsius(80), 10);
    expect(warm.windows[2]).toMatchObject({ min: 21, max: 25 });
    expect(warm.windows[3]).toMatchObject({ min: 0.35, max: 0.55 });
    expect(warm.dewPointMarginC).toBe(2);
    expect(windowWarnings(warm)).toEqual([]);
  });

  it("graft callusing raises no warning; hardening off only the air-minimum one its description expects", () => {
    expect(windowWarnings(BUILT_IN_PRESETS[1]!)).toEqual([]);
    expect(codes(windowWarnings(BUILT_IN_PRESETS[2]!))).toEqual(["air-min-below-rooting"]);
    expect(BUILT_IN_PRESETS[2]!.description).toMatch(/air-minimum warning/);
  });
});
