/**
 * Trade guidance for rooting windows (issue 7 §2–3): the warnings shown before a window is saved,
 * and the presets Benchwarden ships. Pure: no I/O. Values in stored units (°C, % RH, ratio 0–1,
 * seconds). Every threshold names its source; "common practice" marks trade practice without one
 * (REFERENCES.md markers [S] and [CP]).
 */
import { WINDOWED_QUANTITIES, type WindowedQuantity } from "../schemas/quantities.js";
import type { GuidanceSource, PresetNote, QuantityWindow, WindowPreset, WindowWarning } from "../schemas/windows.js";
import { relativeHumidityFromDewPointPct } from "./psychrometrics.js";
import { celsiusDeltaToFahrenheit, celsiusToFahrenheit, fahrenheitToCelsius } from "./units.js";

/** The sources the guidance below rests on. */
export const GUIDANCE_SOURCES = {
  airRootingBand: {
    basis: "common-practice",
    citation: "Common practice for fig and other subtropical fruit-tree cuttings: air 70–80 °F (21–27 °C), little rooting below about 70 °F",
    reference: "REFERENCES.md §6",
  },
  airUpperPublished: {
    basis: "published",
    citation: "Acquaah, Horticulture: Principles and Practices (Pearson), chapter 10: air 18–27 °C for rooting cuttings",
    reference: "REFERENCES.md §6",
  },
  mediumLower: {
    basis: "published",
    citation: "Furuta, Mist Propagation of Plants at Home, University of California Leaflet 2560: propagation medium at 18–24 °C; a cold medium delays or stops rooting",
    reference: "REFERENCES.md §6",
  },
  mediumUpper: {
    basis: "common-practice",
    citation: "Common practice: a rooting medium at 21–25 °C, flagged above 30 °C",
    reference: "REFERENCES.md §6",
  },
  moistureZones: {
    basis: "common-practice",
    citation: "Common practice for peat–perlite: 0.35–0.55 m³/m³ is the target, sustained above about 0.55 is saturated (rot risk), below about 0.20 is dry",
    reference: "REFERENCES.md §7",
  },
  holdOff: {
    basis: "common-practice",
    citation: "Common practice: a cutting takes weeks to root and one cold night can cost the batch, so a fault should be reported within the hour or two",
    reference: "PRODUCT.md §1",
  },
  condensationMargin: {
    basis: "common-practice",
    citation: "Common practice: an alarm margin of 1–2 °C between air temperature and dew point; surfaces at or below the dew point get wet (Ohio State University Extension fact sheet AEX-804-01)",
    reference: "REFERENCES.md §2",
  },
  dewPointFormula: {
    basis: "benchwarden",
    citation: "How Benchwarden checks condensation: the dew point worked out from air temperature and humidity (a standard meteorological formula)",
    reference: "REFERENCES.md §2; shared/domain/psychrometrics.ts",
  },
  alertEngine: {
    basis: "benchwarden",
    citation: "How Benchwarden raises and clears alerts (hold-off delay, clearing band capped at half the window)",
    reference: "shared/domain/window-evaluation.ts",
  },
  ourStartingPoint: {
    basis: "common-practice",
    citation: "Common practice: Benchwarden's own starting point, to be tuned by the manager",
    reference: "shared/domain/window-guidance.ts (BUILT_IN_PRESETS)",
  },
} as const satisfies Record<string, GuidanceSource>;

/** Guidance thresholds, stored units. */
export const GUIDANCE = {
  /** Below about 70 °F (21 °C) rooting slows sharply (common practice, REFERENCES.md §6). */
  airMinRootingC: 21,
  /** Above about 80 °F (27 °C) is past the usual rooting band (REFERENCES.md §6). */
  airMaxRootingC: 27,
  /** A medium below 18 °C slows rooting (Furuta, UC Leaflet 2560; common practice flag). */
  mediumMinC: 18,
  /** Flag a medium above 30 °C (common practice, REFERENCES.md §6). */
  mediumMaxC: 30,
  /** Sustained above about 0.55 m³/m³ is saturated (common practice, REFERENCES.md §7). */
  moistureSaturated: 0.55,
  /** Below about 0.20 m³/m³ is dry (common practice, REFERENCES.md §7). */
  moistureDry: 0.2,
  /** A hold-off longer than 2 h (common practice). */
  longDelayS: 2 * 3600,
  /** A dew-point margin under 1 °C (1–2 °C is common practice, REFERENCES.md §2). */
  smallDewPointMarginC: 1,
} as const;

/** "70 °F (21 °C)": a temperature in both scales, whole degrees unless a decimal matters. */
export function bothScales(tC: number): string {
  const f = celsiusToFahrenheit(tC);
  const round = (x: number) => (Math.abs(x - Math.round(x)) < 0.05 ? String(Math.round(x)) : x.toFixed(1));
  return `${round(f)} °F (${round(tC)} °C)`;
}

/** "2 °C (3.6 °F)": a temperature difference in both scales. */
export function bothScalesDelta(deltaC: number): string {
  const round = (x: number) => (Math.abs(x - Math.round(x)) < 0.05 ? String(Math.round(x)) : x.toFixed(1));
  return `${round(deltaC)} °C (${round(celsiusDeltaToFahrenheit(deltaC))} °F)`;
}

export interface WindowSetForGuidance {
  windows: readonly QuantityWindow[];
  dewPointMarginC: number;
}

function warning(
  code: string,
  quantity: WindowedQuantity | null,
  field: WindowWarning["field"],
  message: string,
  threshold: number | null,
  source: GuidanceSource,
): WindowWarning {
  return { code, quantity, field, message, threshold, source: { ...source } };
}

/** Warnings about one quantity's window taken alone. */
function quantityWarnings(w: QuantityWindow): WindowWarning[] {
  const out: WindowWarning[] = [];
  const q = w.quantity;
  if (q === "air.temperature") {
    if (w.min < GUIDANCE.airMinRootingC) {
      out.push(warning("air-min-below-rooting", q, "min", `An air minimum below about 70 °F (21 °C) lets the house sit where rooting slows sharply.`, GUIDANCE.airMinRootingC, GUIDANCE_SOURCES.airRootingBand));
    }
    if (w.max > GUIDANCE.airMaxRootingC) {
      out.push(warning("air-max-above-rooting", q, "max", `An air maximum above about 80 °F (27 °C) is warmer than the usual 70–80 °F (21–27 °C) band for rooting cuttings.`, GUIDANCE.airMaxRootingC, GUIDANCE_SOURCES.airUpperPublished));
    }
  } else if (q === "medium.temperature") {
    if (w.min < GUIDANCE.mediumMinC) {
      out.push(warning("medium-min-below-rooting", q, "min", `A medium minimum below about 64 °F (18 °C) lets the medium cool to where callusing and rooting slow or stop.`, GUIDANCE.mediumMinC, GUIDANCE_SOURCES.mediumLower));
    }
    if (w.max > GUIDANCE.mediumMaxC) {
      out.push(warning("medium-max-above-rooting", q, "max", `A medium maximum above 86 °F (30 °C) is well past the 70–77 °F (21–25 °C) usual for a rooting medium.`, GUIDANCE.mediumMaxC, GUIDANCE_SOURCES.mediumUpper));
    }
  } else if (q === "medium.moisture") {
    if (w.max > GUIDANCE.moistureSaturated) {
      out.push(warning("moisture-max-saturated", q, "max", `Medium moisture held above about ${GUIDANCE.moistureSaturated * 100} % VWC is saturated: cuttings rot at the base and mould grows.`, GUIDANCE.moistureSaturated, GUIDANCE_SOURCES.moistureZones));
    }
    if (w.min < GUIDANCE.moistureDry) {
      out.push(warning("moisture-min-dry", q, "min", `Below about ${GUIDANCE.moistureDry * 100} % VWC a peat–perlite medium is dry and cuttings stop rooting.`, GUIDANCE.moistureDry, GUIDANCE_SOURCES.moistureZones));
    }
  }

  if (w.delayS > GUIDANCE.longDelayS) {
    out.push(warning("delay-long", q, "delayS", "A hold-off delay over 2 hours lets a fault run that long before anyone is told; one cold night can cost a batch.", GUIDANCE.longDelayS, GUIDANCE_SOURCES.holdOff));
  } else if (w.delayS === 0) {
    out.push(warning("delay-none", q, "delayS", "With no hold-off delay a single reading out of the window raises an alert at once, e.g. when a door is opened.", 0, GUIDANCE_SOURCES.alertEngine));
  }

  if (w.min < w.max) {
    // The alert engine caps the band at half the width (clearingThresholds in window-evaluation.ts).
    const halfWidth = (w.max - w.min) / 2;
    if (w.hysteresis > halfWidth) {
      out.push(warning("hysteresis-capped", q, "hysteresis", "A clearing band wider than half the window counts as half the window, so an alert clears once the value is back in the middle.", halfWidth, GUIDANCE_SOURCES.alertEngine));
    } else if (w.hysteresis === 0) {
      out.push(warning("hysteresis-none", q, "hysteresis", "With no clearing band an alert can clear and raise again and again while the value hovers at a limit.", 0, GUIDANCE_SOURCES.alertEngine));
    }
  }
  return out;
}

/**
 * The relative humidity at which air at `tC` comes within `marginC` of its dew point (the
 * condensation check's threshold), % RH. Undefined when not computable.
 */
export function condensationOnsetRhPct(tC: number, marginC: number): number | undefined {
  return relativeHumidityFromDewPointPct(tC, tC - marginC);
}

/**
 * The guidance warnings for a window set (a zone's windows, or those in force on a bench), in
 * WINDOWED_QUANTITIES order, the dew-point margin last. Assumes the set passed its schema.
 */
export function windowWarnings(set: WindowSetForGuidance): WindowWarning[] {
  const byQuantity = new Map(set.windows.map((w) => [w.quantity, w]));
  const out: WindowWarning[] = [];
  for (const q of WINDOWED_QUANTITIES) {
    const w = byQuantity.get(q);
    if (w) out.push(...quantityWarnings(w));
  }

  // The humidity window against the condensation check: at the coldest air the window allows, the
  // margin is crossed at the lowest RH (e°(T − m)/e°(T) grows with T).
  const air = byQuantity.get("air.temperature");
  const rh = byQuantity.get("air.humidity");
  if (air && rh) {
    const onset = condensationOnsetRhPct(air.min, set.dewPointMarginC);
    if (onset !== undefined && onset < rh.max) {
      out.push(
        warning(
          "humidity-max-meets-condensation",
          "air.humidity",
          "max",
          `At the air minimum of ${bothScales(air.min)}, a ${bothScalesDelta(set.dewPointMarginC)} dew-point margin is reached from about ${Math.floor(onset)} % RH, below this window's maximum of ${Math.round(rh.max)} % RH: expect condensation-risk alerts while humidity is still inside its window.`,
          onset,
          GUIDANCE_SOURCES.dewPointFormula,
        ),
      );
    }
  }

  if (set.dewPointMarginC < GUIDANCE.smallDewPointMarginC) {
    out.push(
      warning(
        "dew-point-margin-small",
        null,
        "dewPointMarginC",
        `A dew-point margin under ${bothScalesDelta(GUIDANCE.smallDewPointMarginC)} warns only when surfaces are about to get wet; 1–2 °C (1.8–3.6 °F) is usual.`,
        GUIDANCE.smallDewPointMarginC,
        GUIDANCE_SOURCES.condensationMargin,
      ),
    );
  }
  return out;
}

// ── built-in presets ──────────────────────────────────────────────────────

/** 70 °F and 80 °F in °C (NIST SP 811): the common-practice rooting band, as a grower types it in °F. */
const AIR_70_F = fahrenheitToCelsius(70);
const AIR_80_F = fahrenheitToCelsius(80);

function note(quantity: WindowedQuantity | null, text: string, source: GuidanceSource): PresetNote {
  return { quantity, note: text, source: { ...source } };
}

/**
 * The presets Benchwarden ships (our own names and starting points). Values: common practice or
 * sourced, as each note says. Built-in presets cannot be edited or deleted; a manager can copy one.
 */
export const BUILT_IN_PRESETS: readonly WindowPreset[] = [
  {
    id: "warm-rooting",
    name: "Warm rooting",
    description: "Hardwood and semi-hardwood cuttings of figs and other subtropical fruit trees on heated benches: warm air, a warm medium, moist but never wet.",
    builtIn: true,
    windows: [
      { quantity: "air.temperature", min: AIR_70_F, max: AIR_80_F, delayS: 600, hysteresis: 0.5 },
      { quantity: "air.humidity", min: 65, max: 85, delayS: 1800, hysteresis: 3 },
      { quantity: "medium.temperature", min: 21, max: 25, delayS: 900, hysteresis: 0.5 },
      { quantity: "medium.moisture", min: 0.35, max: 0.55, delayS: 3600, hysteresis: 0.02 },
    ],
    dewPointMarginC: 2,
    notes: [
      note("air.temperature", "Air 70–80 °F (21.1–26.7 °C).", GUIDANCE_SOURCES.airRootingBand),
      note("air.humidity", "65–85 % RH keeps cuttings from drying while staying clear of the 2 °C dew-point margin at the air minimum.", GUIDANCE_SOURCES.ourStartingPoint),
      note("medium.temperature", "Medium 21–25 °C (70–77 °F).", GUIDANCE_SOURCES.mediumUpper),
      note("medium.moisture", "35–55 % VWC, the target band for peat–perlite.", GUIDANCE_SOURCES.moistureZones),
      note(null, "Dew-point margin 2 °C (3.6 °F).", GUIDANCE_SOURCES.condensationMargin),
    ],
    createdAtMs: null,
    updatedAtMs: null,
  },
  {
    id: "graft-callusing",
    name: "Graft callusing",
    description: "Freshly grafted stock knitting at the union: as warm as rooting, more humid, a slightly drier medium.",
    builtIn: true,
    windows: [
      { quantity: "air.temperature", min: AIR_70_F, max: AIR_80_F, delayS: 600, hysteresis: 0.5 },
      { quantity: "air.humidity", min: 75, max: 90, delayS: 1800, hysteresis: 3 },
      { quantity: "medium.temperature", min: 21, max: 25, delayS: 900, hysteresis: 0.5 },
      { quantity: "medium.moisture", min: 0.3, max: 0.5, delayS: 3600, hysteresis: 0.02 },
    ],
    dewPointMarginC: 1.5,
    notes: [
      note("air.temperature", "Air 70–80 °F (21.1–26.7 °C), as for rooting.", GUIDANCE_SOURCES.airRootingBand),
      note("air.humidity", "75–90 % RH so the union does not dry out.", GUIDANCE_SOURCES.ourStartingPoint),
      note("medium.temperature", "Medium 21–25 °C (70–77 °F).", GUIDANCE_SOURCES.mediumUpper),
      note("medium.moisture", "30–50 % VWC: moist, clear of saturation.", GUIDANCE_SOURCES.moistureZones),
      note(null, "Dew-point margin 1.5 °C (2.7 °F), inside the usual 1–2 °C, so humid air up to 90 % RH does not alarm.", GUIDANCE_SOURCES.condensationMargin),
    ],
    createdAtMs: null,
    updatedAtMs: null,
  },
  {
    id: "hardening-off",
    name: "Hardening off",
    description: "Cuttings that have struck, being weaned to cooler, drier air before potting on. Expect the air-minimum warning: it is about rooting.",
    builtIn: true,
    windows: [
      { quantity: "air.temperature", min: 18, max: 27, delayS: 1200, hysteresis: 0.5 },
      { quantity: "air.humidity", min: 50, max: 80, delayS: 3600, hysteresis: 3 },
      { quantity: "medium.temperature", min: 18, max: 24, delayS: 1800, hysteresis: 0.5 },
      { quantity: "medium.moisture", min: 0.25, max: 0.45, delayS: 3600, hysteresis: 0.02 },
    ],
    dewPointMarginC: 2,
    notes: [
      note("air.temperature", "Air 18–27 °C (64–81 °F).", GUIDANCE_SOURCES.airUpperPublished),
      note("air.humidity", "50–80 % RH, drier than rooting.", GUIDANCE_SOURCES.ourStartingPoint),
      note("medium.temperature", "Medium 18–24 °C (64–75 °F).", GUIDANCE_SOURCES.mediumLower),
      note("medium.moisture", "25–45 % VWC: drier, still above the dry limit of about 20 %.", GUIDANCE_SOURCES.moistureZones),
      note(null, "Dew-point margin 2 °C (3.6 °F).", GUIDANCE_SOURCES.condensationMargin),
    ],
    createdAtMs: null,
    updatedAtMs: null,
  },
];

/** The preset a new zone starts from unless another (or none) is chosen. */
export const DEFAULT_PRESET_ID = "warm-rooting";
