import { z } from "zod";
import { QUANTITY_LABELS } from "../domain/quantity-words.js";
import { PROBE_RANGE } from "../domain/sensor-readings.js";
import { celsiusToFahrenheit, isTemperature } from "../domain/units.js";
import { WINDOWED_QUANTITIES, type WindowedQuantity } from "./quantities.js";

/*
 * Rooting windows: the ONE validation the client's form and the server both run (issue 7 §3).
 * Every value travels in stored (SI) units: °C, % RH, moisture as a ratio 0–1 (m³/m³), delays in
 * seconds; temperature hysteresis and the dew-point margin are °C *differences*. The client
 * converts with shared/domain/units.ts (toDisplayValue / fromDisplayValue, celsiusDeltaToFahrenheit).
 * Field errors come back as RFC 9457 problem details whose `errors[].path` is the zod path, e.g.
 * "windows.0.min" (the first window's minimum) or "dewPointMarginC".
 */

export const windowedQuantitySchema = z.enum(WINDOWED_QUANTITIES);

/** The longest hold-off delay a window accepts: 24 h. */
export const MAX_WINDOW_DELAY_S = 24 * 3600;

/** The dew-point margins a zone or bench accepts, °C (a temperature difference). */
export const DEW_POINT_MARGIN_LIMITS_C = { min: 0, max: 10 } as const;

/** The margin used when a zone has none set: 2 °C (1–2 °C is common practice, REFERENCES.md §2). */
export const DEFAULT_DEW_POINT_MARGIN_C = 2;

/** The probe range in words, both scales for temperatures, e.g. "−40 to 85 °C (−40 to 185 °F)". */
export function probeRangeText(quantity: WindowedQuantity): string {
  const { min, max } = PROBE_RANGE[quantity];
  if (isTemperature(quantity)) return `${min} to ${max} °C (${celsiusToFahrenheit(min)} to ${celsiusToFahrenheit(max)} °F)`;
  if (quantity === "medium.moisture") return `${min * 100} to ${max * 100} % VWC`;
  return `${min} to ${max} % RH`;
}

/** One quantity's rooting window, stored units. Used in responses and as the input of every window form. */
export const quantityWindowSchema = z
  .object({
    quantity: windowedQuantitySchema,
    min: z.number({ error: "Enter a number" }),
    max: z.number({ error: "Enter a number" }),
    /** How long a value must stay out before an alert is raised, seconds (0 … 24 h). */
    delayS: z
      .number({ error: "Enter a number" })
      .int("Use whole seconds")
      .min(0, "The delay cannot be negative")
      .max(MAX_WINDOW_DELAY_S, "Use a delay of at most 24 hours"),
    /** How far back inside the window a value must come before an alert clears (≥ 0, narrower than the window). */
    hysteresis: z.number({ error: "Enter a number" }).min(0, "The clearing band cannot be negative"),
  })
  .superRefine((w, ctx) => {
    const range = PROBE_RANGE[w.quantity];
    const label = QUANTITY_LABELS[w.quantity];
    for (const field of ["min", "max"] as const) {
      if (w[field] < range.min || w[field] > range.max) {
        ctx.addIssue({ code: "custom", path: [field], message: `${label} probes read ${probeRangeText(w.quantity)}; enter a value inside that range` });
      }
    }
    if (!(w.min < w.max)) {
      ctx.addIssue({ code: "custom", path: ["min"], message: "The minimum must be below the maximum" });
      ctx.addIssue({ code: "custom", path: ["max"], message: "The maximum must be above the minimum" });
    } else if (w.hysteresis >= w.max - w.min) {
      ctx.addIssue({ code: "custom", path: ["hysteresis"], message: "The clearing band must be narrower than the window (maximum − minimum)" });
    }
  });
export type QuantityWindow = z.infer<typeof quantityWindowSchema>;

/** Where a value stands against its window. */
export const windowStatusSchema = z.enum(["inside", "below", "above", "unknown"]);
export type WindowStatus = z.infer<typeof windowStatusSchema>;

/** A list of windows with each quantity at most once (the duplicate is flagged on its `quantity`). */
export const quantityWindowListSchema = z
  .array(quantityWindowSchema)
  .max(WINDOWED_QUANTITIES.length)
  .superRefine((windows, ctx) => {
    const seen = new Set<string>();
    windows.forEach((w, i) => {
      if (seen.has(w.quantity)) ctx.addIssue({ code: "custom", path: [i, "quantity"], message: `${QUANTITY_LABELS[w.quantity]} appears twice` });
      seen.add(w.quantity);
    });
  });

/** Air temperature minus dew point below which a condensation-risk alert is raised, °C. */
export const dewPointMarginSchema = z
  .number({ error: "Enter a number" })
  .min(DEW_POINT_MARGIN_LIMITS_C.min, "The margin cannot be negative")
  .max(DEW_POINT_MARGIN_LIMITS_C.max, `Use a margin of at most ${DEW_POINT_MARGIN_LIMITS_C.max} °C (18 °F)`);

/**
 * PUT /api/zones/:id/windows — the zone's whole window set. A quantity left out is not watched
 * on the zone's benches (unless a bench overrides it).
 */
export const zoneWindowsInputSchema = z.object({
  windows: quantityWindowListSchema,
  dewPointMarginC: dewPointMarginSchema,
});
export type ZoneWindowsInput = z.infer<typeof zoneWindowsInputSchema>;

/**
 * PUT /api/benches/:id/windows — the bench's overrides only: each window listed replaces the
 * zone's window of that quantity whole; quantities left out follow the zone. `dewPointMarginC`
 * null follows the zone's margin. `{ windows: [], dewPointMarginC: null }` removes every override.
 */
export const benchWindowsInputSchema = z.object({
  windows: quantityWindowListSchema,
  dewPointMarginC: dewPointMarginSchema.nullable(),
});
export type BenchWindowsInput = z.infer<typeof benchWindowsInputSchema>;

/** Query of the window PUTs, preset applications, creations and updates: `?dryRun=true` validates and returns warnings, saves nothing. */
export const dryRunQuerySchema = z.object({
  dryRun: z
    .enum(["true", "false", "1", "0"])
    .optional()
    .transform((v) => v === "true" || v === "1"),
});

// ── guidance warnings ──────────────────────────────────────────────────────

/**
 * Where a piece of guidance comes from. `basis`: "published" (a source seen in print),
 * "common-practice" (trade practice, no single source), "benchwarden" (how Benchwarden's own
 * alerting works, e.g. the hysteresis cap). `citation` is for people; `reference` points into the
 * team's check-value sheet (REFERENCES.md) or the code that implements the rule.
 */
export const guidanceSourceSchema = z.object({
  basis: z.enum(["published", "common-practice", "benchwarden"]),
  citation: z.string(),
  reference: z.string(),
});
export type GuidanceSource = z.infer<typeof guidanceSourceSchema>;

/** The fields of a window set a warning can point at. */
export const windowFieldSchema = z.enum(["min", "max", "delayS", "hysteresis", "dewPointMarginC"]);
export type WindowField = z.infer<typeof windowFieldSchema>;

/**
 * A value that is allowed but leaves common guidance: shown plainly before saving, never blocks.
 * `quantity` is null for the dew-point margin. `threshold` is the guidance value crossed, in
 * stored units of that field (°C, % RH, ratio, seconds; °C difference for margins), so the client
 * can show it in the user's unit; `message` already names both °F and °C.
 */
export const windowWarningSchema = z.object({
  /** Stable identifier, e.g. "air-min-below-rooting". */
  code: z.string(),
  quantity: windowedQuantitySchema.nullable(),
  field: windowFieldSchema,
  message: z.string(),
  threshold: z.number().nullable(),
  source: guidanceSourceSchema,
});
export type WindowWarning = z.infer<typeof windowWarningSchema>;

// ── zone and bench responses ───────────────────────────────────────────────

export const benchOverrideSummarySchema = z.object({
  benchId: z.number().int(),
  benchName: z.string(),
  /** Quantities the bench overrides. */
  quantities: z.array(windowedQuantitySchema),
  /** The bench's own margin, null when it follows the zone. */
  dewPointMarginC: z.number().nullable(),
});

/** GET /api/zones/:id/windows */
export const zoneWindowsResponseSchema = z.object({
  zone: z.object({ id: z.number().int(), name: z.string(), siteId: z.number().int(), siteName: z.string(), archived: z.boolean() }),
  /** The zone's windows, in WINDOWED_QUANTITIES order; a quantity missing is not watched. */
  windows: z.array(quantityWindowSchema),
  dewPointMarginC: z.number(),
  /** Guidance warnings for these values. */
  warnings: z.array(windowWarningSchema),
  /** Live benches of the zone that override something. */
  benchOverrides: z.array(benchOverrideSummarySchema),
});
export type ZoneWindowsResponse = z.infer<typeof zoneWindowsResponseSchema>;

/** PUT /api/zones/:id/windows, POST /api/zones/:id/windows/preset: what was (or, on a dry run, would be) saved. */
export const zoneWindowsSaveResponseSchema = zoneWindowsResponseSchema.extend({
  dryRun: z.boolean(),
  /** False when the values equal what was stored (nothing saved, nothing audited). */
  changed: z.boolean(),
});
export type ZoneWindowsSaveResponse = z.infer<typeof zoneWindowsSaveResponseSchema>;

export const windowLimitFieldSchema = z.enum(["min", "max", "delayS", "hysteresis"]);
export type WindowLimitField = z.infer<typeof windowLimitFieldSchema>;

/** One quantity on a bench: the window in force, where it comes from, and what differs from the zone. */
export const effectiveWindowSchema = z.object({
  quantity: windowedQuantitySchema,
  /** The window in force (null: not watched on this bench). */
  window: quantityWindowSchema.nullable(),
  source: z.enum(["zone", "bench", "none"]),
  zoneWindow: quantityWindowSchema.nullable(),
  /** Fields where the bench's override differs from the zone's window; empty when it follows the zone. */
  differingFields: z.array(windowLimitFieldSchema),
});
export type EffectiveWindow = z.infer<typeof effectiveWindowSchema>;

/** GET /api/benches/:id/windows */
export const benchWindowsResponseSchema = z.object({
  bench: z.object({ id: z.number().int(), name: z.string(), zoneId: z.number().int(), zoneName: z.string(), archived: z.boolean() }),
  zone: z.object({ windows: z.array(quantityWindowSchema), dewPointMarginC: z.number() }),
  overrides: z.object({ windows: z.array(quantityWindowSchema), dewPointMarginC: z.number().nullable() }),
  /** One entry per windowed quantity, in WINDOWED_QUANTITIES order. */
  effective: z.array(effectiveWindowSchema),
  dewPointMargin: z.object({ valueC: z.number(), source: z.enum(["zone", "bench"]), differsFromZone: z.boolean() }),
  /** Guidance warnings for the windows in force on the bench. */
  warnings: z.array(windowWarningSchema),
});
export type BenchWindowsResponse = z.infer<typeof benchWindowsResponseSchema>;

export const benchWindowsSaveResponseSchema = benchWindowsResponseSchema.extend({ dryRun: z.boolean(), changed: z.boolean() });
export type BenchWindowsSaveResponse = z.infer<typeof benchWindowsSaveResponseSchema>;

// ── presets ────────────────────────────────────────────────────────────────

/** Why a built-in preset holds a value, with its source. */
export const presetNoteSchema = z.object({
  /** null: the dew-point margin. */
  quantity: windowedQuantitySchema.nullable(),
  note: z.string(),
  source: guidanceSourceSchema,
});
export type PresetNote = z.infer<typeof presetNoteSchema>;

/** A named window set. Built-in presets ship with Benchwarden (ids are words) and cannot be edited. */
export const windowPresetSchema = z.object({
  /** Built-in: a slug such as "warm-rooting"; custom: the database id as a string. */
  id: z.string(),
  name: z.string(),
  description: z.string(),
  builtIn: z.boolean(),
  windows: z.array(quantityWindowSchema),
  dewPointMarginC: z.number(),
  /** Built-in presets: where each value comes from; empty for custom presets. */
  notes: z.array(presetNoteSchema),
  createdAtMs: z.number().nullable(),
  updatedAtMs: z.number().nullable(),
});
export type WindowPreset = z.infer<typeof windowPresetSchema>;

/** GET /api/window-presets: built-ins first, then custom presets by name. */
export const windowPresetsResponseSchema = z.object({ presets: z.array(windowPresetSchema) });

export const presetNameSchema = z.string().trim().min(1, "Enter a name").max(80, "Use at most 80 characters");

/** POST /api/window-presets */
export const windowPresetInputSchema = z.object({
  name: presetNameSchema,
  description: z.string().trim().max(500, "Use at most 500 characters").default(""),
  windows: quantityWindowListSchema.refine((w) => w.length > 0, { message: "A preset needs at least one window" }),
  dewPointMarginC: dewPointMarginSchema,
});
export type WindowPresetInput = z.infer<typeof windowPresetInputSchema>;

/** PATCH /api/window-presets/:id (custom presets only) */
export const updateWindowPresetInputSchema = z
  .object({
    name: presetNameSchema.optional(),
    description: z.string().trim().max(500, "Use at most 500 characters").optional(),
    windows: quantityWindowListSchema.refine((w) => w.length > 0, { message: "A preset needs at least one window" }).optional(),
    dewPointMarginC: dewPointMarginSchema.optional(),
  })
  .refine((v) => Object.values(v).some((x) => x !== undefined), { message: "Nothing to change" });
export type UpdateWindowPresetInput = z.infer<typeof updateWindowPresetInputSchema>;

/**
 * POST /api/window-presets and PATCH /api/window-presets/:id: what was (or, with `?dryRun=true`,
 * would be) saved, and its guidance warnings. A dry run checks everything a save checks (the
 * schema, a free name, a custom preset) and saves nothing; a preset not created yet has id null.
 */
export const windowPresetResponseSchema = z.object({
  preset: windowPresetSchema.extend({ id: z.string().nullable() }),
  warnings: z.array(windowWarningSchema),
  dryRun: z.boolean(),
  /** False when an update equals what was stored (nothing saved, nothing audited). */
  changed: z.boolean(),
});
export type WindowPresetResponse = z.infer<typeof windowPresetResponseSchema>;

/**
 * POST /api/zones/:id/windows/preset — replace the zone's windows and margin with a preset's.
 * `clearBenchOverrides` also removes the overrides of the zone's live benches (default: kept).
 */
export const applyZonePresetInputSchema = z.object({
  presetId: z.string().trim().min(1, "Choose a preset"),
  clearBenchOverrides: z.boolean().default(false),
});
export type ApplyZonePresetInput = z.infer<typeof applyZonePresetInputSchema>;

/** POST /api/benches/:id/windows/preset — the preset's windows and margin become the bench's overrides. */
export const applyBenchPresetInputSchema = z.object({ presetId: z.string().trim().min(1, "Choose a preset") });
export type ApplyBenchPresetInput = z.infer<typeof applyBenchPresetInputSchema>;
