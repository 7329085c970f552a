import { z } from "zod";
import { rowIdParamSchema, rowIdSchema } from "./ids.js";
import { BATCH_STAGES, calendarDayNumber, type BatchStage } from "../domain/batch.js";
import { windowedQuantitySchema } from "./windows.js";

/*
 * Batches of cuttings, their observations and photos, and the strike-rate reports (issue 6 §1, §2,
 * §6; PRODUCT.md §3). Who may do what (the server enforces it): growers, managers and admins
 * create, edit, move and close batches and record observations and photos; every signed-in role
 * (viewers too) reads them and the reports.
 *
 * Conventions: dates a person names ("stuck on", "observed on", "closed on") are calendar dates
 * "YYYY-MM-DD" of the site's time zone; instants are ms since 1970 (UTC), in fields ending in Ms.
 * Rates are ratios 0–1 (strikeRate 0.824 = 82.4 %); shares of time are percentages 0–100 (fields
 * ending in Pct). Field errors come back as RFC 9457 problem details whose errors[].path is the
 * zod path, e.g. "countStuck" or "hormoneProduct".
 */

const idSchema = rowIdSchema;

/** A calendar date "YYYY-MM-DD" that exists (2025-02-30 is refused). */
export const calendarDateSchema = z
  .string({ error: "Enter a date" })
  .refine((d) => calendarDayNumber(d) !== undefined, { message: "Enter a date as YYYY-MM-DD" });

/** Free text that may be left empty: trimmed; "" becomes null. */
const optionalText = (max: number) =>
  z
    .string()
    .trim()
    .max(max, `Use at most ${max} characters`)
    .nullable()
    .transform((v) => (v === "" ? null : v));

// ── words ────────────────────────────────────────────────────────────────────

/** A batch's stage (shared/domain/batch.ts): the propagation path, then "lost" (the whole batch failed). */
export const batchStageSchema = z.enum(BATCH_STAGES);
export const STAGE_LABELS: Record<BatchStage, string> = {
  stuck: "Stuck",
  callused: "Callused",
  "root-initials": "Root initials",
  rooted: "Rooted",
  "potted-on": "Potted on",
  lost: "Lost",
};

/** How the base of the cuttings was prepared; several may apply (scored and dipped in hormone). */
export const BASE_TREATMENTS = ["fresh-cut", "scored", "hormone"] as const;
export const baseTreatmentSchema = z.enum(BASE_TREATMENTS);
export type BaseTreatment = z.infer<typeof baseTreatmentSchema>;
export const BASE_TREATMENT_LABELS: Record<BaseTreatment, string> = {
  "fresh-cut": "Fresh cut",
  scored: "Scored (wounded)",
  hormone: "Rooting hormone",
};

/** What covers the exposed part above the medium, against drying out. */
export const WRAPPINGS = ["none", "film", "wax", "other"] as const;
export const wrappingSchema = z.enum(WRAPPINGS);
export type Wrapping = z.infer<typeof wrappingSchema>;
export const WRAPPING_LABELS: Record<Wrapping, string> = {
  none: "None",
  film: "Stretch film / grafting tape",
  wax: "Sealing wax on the top cut",
  other: "Other (say in the notes)",
};

/** How a batch ended. */
export const BATCH_OUTCOMES = ["potted-on", "lost", "discarded"] as const;
export const batchOutcomeSchema = z.enum(BATCH_OUTCOMES);
export type BatchOutcome = z.infer<typeof batchOutcomeSchema>;
export const OUTCOME_LABELS: Record<BatchOutcome, string> = {
  "potted-on": "Potted on",
  lost: "Lost",
  discarded: "Discarded",
};

/** What a grower can flag on an observation. Every flag counts as a problem in a walk-through summary. */
export const OBSERVATION_FLAGS = ["mould", "rot", "medium-too-wet", "medium-too-dry", "pests", "buds-breaking"] as const;
export const observationFlagSchema = z.enum(OBSERVATION_FLAGS);
export type ObservationFlag = z.infer<typeof observationFlagSchema>;
export const FLAG_LABELS: Record<ObservationFlag, string> = {
  mould: "Mould",
  rot: "Rot",
  "medium-too-wet": "Medium too wet",
  "medium-too-dry": "Medium too dry",
  pests: "Pests",
  "buds-breaking": "Buds breaking",
};

/** The cautions the batch form shows beside the hormone field (PRODUCT.md §6). */
export const HORMONE_CAUTION = "Rooting hormones and fungicides: follow the label (rates, gloves, re-entry and disposal).";

// ── batches ──────────────────────────────────────────────────────────────────

/** The most cuttings one batch may hold. */
export const MAX_COUNT_STUCK = 100_000;

const batchFieldShape = {
  variety: z.string({ error: "Enter the variety" }).trim().min(1, "Enter the variety").max(120, "Use at most 120 characters"),
  /** Where the wood came from, e.g. "Mother tree, row 4" or a supplier's lot. */
  woodSource: optionalText(200),
  stuckOn: calendarDateSchema,
  countStuck: z
    .number({ error: "Enter a number" })
    .int("Use a whole number")
    .min(1, "Stick at least one cutting")
    .max(MAX_COUNT_STUCK, `Use at most ${MAX_COUNT_STUCK.toLocaleString("en-US")} cuttings; split larger lots`),
  /** Typical diameter of the cuttings, mm. */
  thicknessMm: z.number({ error: "Enter a number" }).positive("Enter a thickness above 0 mm").max(100, "Use at most 100 mm").nullable(),
  /** Buds left above the medium (one to three is common practice for fig cuttings). */
  budsAboveMedium: z.number({ error: "Enter a number" }).int("Use a whole number").min(0).max(50).nullable(),
  baseTreatments: z.array(baseTreatmentSchema).max(BASE_TREATMENTS.length),
  /** Product and strength when "hormone" is among the treatments, e.g. "IBA 3000 ppm talc". */
  hormoneProduct: optionalText(200),
  wrapping: wrappingSchema.nullable(),
  notes: optionalText(4000),
};

/**
 * The treatment rule both sides run: treatments listed once; a product named exactly when
 * "hormone" is among them. Returns field issues (path relative to the batch).
 */
export function treatmentIssues(t: { baseTreatments: readonly string[]; hormoneProduct: string | null }): { path: string; message: string }[] {
  const issues: { path: string; message: string }[] = [];
  if (new Set(t.baseTreatments).size !== t.baseTreatments.length) issues.push({ path: "baseTreatments", message: "List each treatment once" });
  const hormone = t.baseTreatments.includes("hormone");
  if (hormone && !t.hormoneProduct) issues.push({ path: "hormoneProduct", message: "Name the product and strength, e.g. IBA 3000 ppm talc" });
  if (!hormone && t.hormoneProduct) issues.push({ path: "hormoneProduct", message: "Tick rooting hormone, or clear the product" });
  return issues;
}

/** POST /api/batches — a new batch on a bench in use. Optional fields default to empty (null / []). */
export const createBatchInputSchema = z
  .object({
    ...batchFieldShape,
    woodSource: batchFieldShape.woodSource.default(null),
    thicknessMm: batchFieldShape.thicknessMm.default(null),
    budsAboveMedium: batchFieldShape.budsAboveMedium.default(null),
    baseTreatments: batchFieldShape.baseTreatments.default([]),
    hormoneProduct: batchFieldShape.hormoneProduct.default(null),
    wrapping: batchFieldShape.wrapping.default(null),
    notes: batchFieldShape.notes.default(null),
    benchId: idSchema,
  })
  .superRefine((b, ctx) => {
    for (const issue of treatmentIssues(b)) ctx.addIssue({ code: "custom", path: [issue.path], message: issue.message });
  });
export type CreateBatchInput = z.infer<typeof createBatchInputSchema>;

/**
 * PATCH /api/batches/:id — any of the batch's own fields; what is left out stays. The bench is
 * changed by a move (POST /api/batches/:id/move), never here. The treatment rule is checked on the
 * result. Changing `stuckOn` moves the start of the first placement; it may not pass a later move
 * or an observation.
 */
export const updateBatchInputSchema = z.object(batchFieldShape).partial().strict();
export type UpdateBatchInput = z.infer<typeof updateBatchInputSchema>;

/**
 * POST /api/batches/:id/move — the batch goes to another bench in use. `effectiveAtMs` (default
 * now) is when it moved: not in the future, not before its current placement began. The history
 * keeps every placement with its times (the report's time-in-window follows the batch).
 */
export const moveBatchInputSchema = z.object({
  benchId: idSchema,
  effectiveAtMs: z.number().int().positive().optional(),
  note: optionalText(500).optional(),
});
export type MoveBatchInput = z.infer<typeof moveBatchInputSchema>;

/**
 * POST /api/batches/:id/close — the batch ends. The final counts default to the latest
 * observation's; they must add up (rooted + lost ≤ stuck). `closedOn` defaults to today (site time)
 * and may not be before the batch was stuck or in the future.
 */
export const closeBatchInputSchema = z.object({
  outcome: batchOutcomeSchema,
  closedOn: calendarDateSchema.optional(),
  rootedCount: z.number({ error: "Enter a number" }).int("Use a whole number").min(0).optional(),
  lostCount: z.number({ error: "Enter a number" }).int("Use a whole number").min(0).optional(),
  note: optionalText(1000).optional(),
});
export type CloseBatchInput = z.infer<typeof closeBatchInputSchema>;

const benchRefSchema = z.object({
  benchId: z.number().int(),
  benchName: z.string(),
  zoneId: z.number().int(),
  zoneName: z.string(),
});

/** One stretch a batch spent on a bench: [fromMs, toMs), toMs null while it is still there. */
export const batchPlacementSchema = benchRefSchema.extend({
  fromMs: z.number(),
  toMs: z.number().nullable(),
  /** Why it moved, as the mover wrote it. */
  note: z.string().nullable(),
  movedByName: z.string().nullable(),
});
export type BatchPlacement = z.infer<typeof batchPlacementSchema>;

/** Counts so far and the rates they give (shared/domain/batch.ts batchTally). */
export const batchTallySchema = z.object({
  stuck: z.number().int(),
  rooted: z.number().int(),
  lost: z.number().int(),
  /** Neither rooted nor lost yet. */
  pending: z.number().int(),
  /** rooted / stuck, 0–1. */
  strikeRate: z.number().nullable(),
  /** lost / stuck, 0–1. */
  lossRate: z.number().nullable(),
  /** True once the batch is closed: the counts are the final ones, not the latest observation's. */
  isFinal: z.boolean(),
});
export type BatchTallyView = z.infer<typeof batchTallySchema>;

export const observationSummarySchema = z.object({
  id: z.number().int(),
  observedOn: z.string(),
  stage: batchStageSchema,
  flags: z.array(observationFlagSchema),
  note: z.string().nullable(),
  photoCount: z.number().int(),
});
export type ObservationSummary = z.infer<typeof observationSummarySchema>;

export const batchViewSchema = z.object({
  id: z.number().int(),
  variety: z.string(),
  woodSource: z.string().nullable(),
  stuckOn: z.string(),
  countStuck: z.number().int(),
  thicknessMm: z.number().nullable(),
  budsAboveMedium: z.number().int().nullable(),
  baseTreatments: z.array(baseTreatmentSchema),
  hormoneProduct: z.string().nullable(),
  wrapping: wrappingSchema.nullable(),
  notes: z.string().nullable(),
  /** Where it is now (where it was when it closed). */
  bench: benchRefSchema.extend({ siteId: z.number().int(), timeZone: z.string() }),
  /** Every placement, oldest first; the last is the current one. */
  placements: z.array(batchPlacementSchema),
  status: z.enum(["open", "closed"]),
  /** The latest observation's stage ("stuck" before any); for a closed batch, "potted-on" or "lost" follow the outcome. */
  stage: batchStageSchema,
  tally: batchTallySchema,
  /** Whole days from sticking to today (open) or to the closing date. */
  ageDays: z.number().int(),
  /** Days from sticking to the first observation at that stage or later; null until seen. */
  daysToCallus: z.number().int().nullable(),
  daysToRootInitials: z.number().int().nullable(),
  daysToRooted: z.number().int().nullable(),
  lastObservation: observationSummarySchema.nullable(),
  observationCount: z.number().int(),
  photoCount: z.number().int(),
  outcome: batchOutcomeSchema.nullable(),
  closedOn: z.string().nullable(),
  closedAtMs: z.number().nullable(),
  closeNote: z.string().nullable(),
  createdAtMs: z.number(),
  createdByName: z.string(),
  updatedAtMs: z.number(),
});
export type BatchView = z.infer<typeof batchViewSchema>;

export const batchResponseSchema = z.object({ batch: batchViewSchema });
export type BatchResponse = z.infer<typeof batchResponseSchema>;

/**
 * GET /api/batches — newest stuck first. `status` open (default), closed or all; the other filters
 * combine. `variety` matches whole names, ignoring case; `stuckFrom`/`stuckTo` bound the date stuck
 * (inclusive). `zoneId` and `benchId` look at where batches are now.
 */
export const batchesQuerySchema = z.object({
  status: z.enum(["open", "closed", "all"]).default("open"),
  siteId: rowIdParamSchema.optional(),
  zoneId: rowIdParamSchema.optional(),
  benchId: rowIdParamSchema.optional(),
  variety: z.string().trim().min(1).max(120).optional(),
  stuckFrom: calendarDateSchema.optional(),
  stuckTo: calendarDateSchema.optional(),
  limit: z.coerce.number().int().min(1).max(1000).default(200),
});
export type BatchesQuery = z.infer<typeof batchesQuerySchema>;

export const batchesResponseSchema = z.object({ batches: z.array(batchViewSchema) });
export type BatchesResponse = z.infer<typeof batchesResponseSchema>;

// ── observations ─────────────────────────────────────────────────────────────

/** A count on an observation: a running total as of that day ("rooted so far"), or null when not counted. */
const countSoFar = z.number({ error: "Enter a number" }).int("Use a whole number").min(0, "Counts cannot be negative").nullable();

/**
 * POST /api/batches/:id/observations — what the grower saw on the batch.
 *
 * `clientId` is a UUID the tablet makes when the observation is entered (crypto.randomUUID()) and
 * keeps with it while it waits to be sent: re-sending the same clientId (after a dropped
 * connection) stores nothing new and answers 200 with the observation already stored (201 when new).
 *
 * Counts are running totals as seen that day (how many have rooted so far, how many are lost so
 * far), not increments, so a re-sent or corrected observation never counts twice; they must add up
 * (rooted + lost ≤ stuck). `observedOn` defaults to today (site time); not before the batch was
 * stuck, not in the future. Pass `roundId` when recording during a walk-through. Photos are
 * uploaded afterwards to POST /api/observations/:id/photos.
 */
export const createObservationInputSchema = z.object({
  clientId: z.uuid("Send a UUID made on the device"),
  observedOn: calendarDateSchema.optional(),
  stage: batchStageSchema,
  rootedCount: countSoFar.default(null),
  lostCount: countSoFar.default(null),
  flags: z
    .array(observationFlagSchema)
    .max(OBSERVATION_FLAGS.length)
    .refine((f) => new Set(f).size === f.length, { message: "List each flag once" })
    .default([]),
  note: optionalText(2000).default(null),
  roundId: idSchema.nullable().default(null),
});
export type CreateObservationInput = z.infer<typeof createObservationInputSchema>;

/** PATCH /api/observations/:id — correct an observation; what is left out stays. */
export const updateObservationInputSchema = z
  .object({
    observedOn: calendarDateSchema,
    stage: batchStageSchema,
    rootedCount: countSoFar,
    lostCount: countSoFar,
    flags: z
      .array(observationFlagSchema)
      .max(OBSERVATION_FLAGS.length)
      .refine((f) => new Set(f).size === f.length, { message: "List each flag once" }),
    note: optionalText(2000),
  })
  .partial()
  .strict();
export type UpdateObservationInput = z.infer<typeof updateObservationInputSchema>;

/**
 * Photo uploads (POST /api/observations/:id/photos, multipart/form-data, files in field `photos`).
 * Images only, judged by their content (JPEG, PNG or WebP), never by name or declared type; the
 * stored copy is turned upright (EXIF orientation), stripped of metadata (GPS, camera) and re-encoded
 * as JPEG at most `storedMaxPx` on its long side; a thumbnail at most `thumbnailMaxPx` is made at
 * once. The same image sent again to the same observation is stored once (a retry is harmless).
 */
export const PHOTO_LIMITS = {
  field: "photos",
  maxBytes: 10 * 1024 * 1024,
  maxPerUpload: 6,
  maxPerObservation: 12,
  formats: ["jpeg", "png", "webp"],
  storedMaxPx: 2560,
  thumbnailMaxPx: 320,
} as const;

/** A stored photo. Both URLs answer only to signed-in users (session cookie or bearer token). */
export const photoViewSchema = z.object({
  id: z.number().int(),
  observationId: z.number().int(),
  /** GET: the photo, image/jpeg. */
  url: z.string(),
  /** GET: the thumbnail, image/jpeg. */
  thumbnailUrl: z.string(),
  width: z.number().int(),
  height: z.number().int(),
  bytes: z.number().int(),
  thumbnailWidth: z.number().int(),
  thumbnailHeight: z.number().int(),
  uploadedAtMs: z.number(),
  uploadedByName: z.string(),
});
export type PhotoView = z.infer<typeof photoViewSchema>;

export const observationViewSchema = z.object({
  id: z.number().int(),
  clientId: z.string(),
  batchId: z.number().int(),
  roundId: z.number().int().nullable(),
  observedOn: z.string(),
  stage: batchStageSchema,
  rootedCount: z.number().int().nullable(),
  lostCount: z.number().int().nullable(),
  flags: z.array(observationFlagSchema),
  note: z.string().nullable(),
  recordedAtMs: z.number(),
  recordedBy: z.object({ userId: z.number().int().nullable(), name: z.string() }),
  updatedAtMs: z.number(),
  photos: z.array(photoViewSchema),
});
export type ObservationView = z.infer<typeof observationViewSchema>;

/** Answer of POST /api/batches/:id/observations: `created` false when the clientId was already stored. */
export const createObservationResponseSchema = z.object({ observation: observationViewSchema, created: z.boolean() });
export type CreateObservationResponse = z.infer<typeof createObservationResponseSchema>;

export const observationResponseSchema = z.object({ observation: observationViewSchema });
export type ObservationResponse = z.infer<typeof observationResponseSchema>;

/** GET /api/batches/:id/observations — oldest first (by date, then when recorded). */
export const observationsResponseSchema = z.object({ observations: z.array(observationViewSchema) });
export type ObservationsResponse = z.infer<typeof observationsResponseSchema>;

/** The longest range GET /api/observations answers: as long as a chart's (shared/schemas/readings.ts). */
export const MAX_OBSERVATIONS_RANGE_MS = 400 * 86_400_000;

/**
 * GET /api/observations — the observations made on a bench (`benchId`), or on any bench of a zone
 * (`zoneId`), in [fromMs, toMs): the history charts' markers. Give one of benchId and zoneId.
 * "On a bench" follows the batch's placements: an observation belongs to the bench its batch stood
 * on when it was made (shared/domain/batch-calendar.ts observationTime, batch.ts placementAt).
 * At most `limit`, the newest; `isTruncated` says more were left out.
 */
export const benchObservationsQuerySchema = z
  .object({
    benchId: rowIdParamSchema.optional(),
    zoneId: rowIdParamSchema.optional(),
    fromMs: z.coerce.number({ error: "Give fromMs, ms since 1970" }).int().min(0),
    toMs: z.coerce.number({ error: "Give toMs, ms since 1970" }).int().min(0),
    limit: z.coerce.number().int().min(1).max(2000).default(1000),
  })
  .superRefine((q, ctx) => {
    if ((q.benchId === undefined) === (q.zoneId === undefined)) {
      ctx.addIssue({ code: "custom", path: ["benchId"], message: "Give either benchId or zoneId" });
    }
    if (!(q.fromMs < q.toMs)) ctx.addIssue({ code: "custom", path: ["fromMs"], message: "'fromMs' must be before 'toMs'" });
    else if (q.toMs - q.fromMs > MAX_OBSERVATIONS_RANGE_MS) ctx.addIssue({ code: "custom", path: ["fromMs"], message: "Ask for at most 400 days at a time" });
  });
export type BenchObservationsQuery = z.infer<typeof benchObservationsQuerySchema>;

/** An observation placed in time on the bench its batch stood on. */
export const benchObservationSchema = z.object({
  id: z.number().int(),
  batchId: z.number().int(),
  variety: z.string(),
  countStuck: z.number().int(),
  benchId: z.number().int(),
  benchName: z.string(),
  /** When it was made: the recording instant, or local noon of its date when `isDateOnly`. */
  timeMs: z.number(),
  /** Entered on a later day than it names: only the date is known. */
  isDateOnly: z.boolean(),
  observedOn: z.string(),
  stage: batchStageSchema,
  rootedCount: z.number().int().nullable(),
  lostCount: z.number().int().nullable(),
  flags: z.array(observationFlagSchema),
  note: z.string().nullable(),
  recordedByName: z.string(),
});
export type BenchObservation = z.infer<typeof benchObservationSchema>;

/** Oldest first. */
export const benchObservationsResponseSchema = z.object({ observations: z.array(benchObservationSchema), isTruncated: z.boolean() });
export type BenchObservationsResponse = z.infer<typeof benchObservationsResponseSchema>;

/** Answer of a photo upload: the photos of this upload (already stored ones included) and the observation now. */
export const uploadPhotosResponseSchema = z.object({ photos: z.array(photoViewSchema), observation: observationViewSchema });
export type UploadPhotosResponse = z.infer<typeof uploadPhotosResponseSchema>;

// ── reports ──────────────────────────────────────────────────────────────────

/**
 * GET /api/reports/strike-rates (and the batches CSV): which batches to look at. Dates bound the
 * date stuck (inclusive); `status` default all. At most MAX_REPORT_BATCHES batches: narrow the
 * filters for more.
 */
export const reportQuerySchema = z.object({
  status: z.enum(["open", "closed", "all"]).default("all"),
  siteId: rowIdParamSchema.optional(),
  zoneId: rowIdParamSchema.optional(),
  benchId: rowIdParamSchema.optional(),
  variety: z.string().trim().min(1).max(120).optional(),
  stuckFrom: calendarDateSchema.optional(),
  stuckTo: calendarDateSchema.optional(),
});
export type ReportQuery = z.infer<typeof reportQuerySchema>;

export const MAX_REPORT_BATCHES = 500;

/**
 * Time in window of one quantity over a batch's life (from local midnight of the day stuck to the
 * close, or now), on the benches it sat on, against each bench's window in force now. Minutes add
 * up to the life; `insidePct` is of the time with data (no data — a silent or missing probe — is
 * counted apart, in noDataMinutes). Degree-hours are in stored units × hours (°C·h; ratio·h for
 * moisture).
 */
export const quantityTimeInWindowSchema = z.object({
  quantity: windowedQuantitySchema,
  /** The window used (of the bench it was on longest), stored units; null when no window is set. */
  windowMin: z.number().nullable(),
  windowMax: z.number().nullable(),
  insidePct: z.number().nullable(),
  insideMinutes: z.number(),
  belowMinutes: z.number(),
  aboveMinutes: z.number(),
  noDataMinutes: z.number(),
  degreeHoursBelowMin: z.number(),
  degreeHoursAboveMax: z.number(),
});
export type QuantityTimeInWindow = z.infer<typeof quantityTimeInWindowSchema>;

export const batchReportRowSchema = z.object({
  batchId: z.number().int(),
  variety: z.string(),
  woodSource: z.string().nullable(),
  stuckOn: z.string(),
  closedOn: z.string().nullable(),
  status: z.enum(["open", "closed"]),
  outcome: batchOutcomeSchema.nullable(),
  stage: batchStageSchema,
  ageDays: z.number().int(),
  tally: batchTallySchema,
  daysToCallus: z.number().int().nullable(),
  daysToRootInitials: z.number().int().nullable(),
  daysToRooted: z.number().int().nullable(),
  thicknessMm: z.number().nullable(),
  budsAboveMedium: z.number().int().nullable(),
  baseTreatments: z.array(baseTreatmentSchema),
  hormoneProduct: z.string().nullable(),
  wrapping: wrappingSchema.nullable(),
  /** The bench it spent most of its life on (its group in byBench). */
  mainBench: benchRefSchema,
  placements: z.array(batchPlacementSchema),
  timeInWindow: z.array(quantityTimeInWindowSchema),
  /**
   * True when a stretch held too many readings to walk one by one and was read as bucket means
   * (at most REPORT_SAMPLES_PER_SERIES per quantity and bench stretch): short excursions may be smoothed.
   */
  sampled: z.boolean(),
});
export type BatchReportRow = z.infer<typeof batchReportRowSchema>;

export const daysSummarySchema = z.object({
  reached: z.number().int(),
  of: z.number().int(),
  meanDays: z.number().nullable(),
  medianDays: z.number().nullable(),
});

/** A group of batches (one variety, or one bench): pooled strike rate Σ rooted / Σ stuck, days, time in window. */
export const groupReportRowSchema = z.object({
  /** The variety's name as first written, or the bench id as text. */
  key: z.string(),
  label: z.string(),
  batchCount: z.number().int(),
  stuck: z.number().int(),
  rooted: z.number().int(),
  lost: z.number().int(),
  strikeRate: z.number().nullable(),
  lossRate: z.number().nullable(),
  daysToCallus: daysSummarySchema,
  daysToRootInitials: daysSummarySchema,
  daysToRooted: daysSummarySchema,
  /** Σ inside / Σ time with data over the group's batches, 0–100, per quantity. */
  timeInWindow: z.array(z.object({ quantity: windowedQuantitySchema, insidePct: z.number().nullable() })),
});
export type GroupReportRow = z.infer<typeof groupReportRowSchema>;

/** GET /api/reports/strike-rates — per batch, per variety and per bench, side by side. */
export const strikeRateReportSchema = z.object({
  generatedAtMs: z.number(),
  batches: z.array(batchReportRowSchema),
  byVariety: z.array(groupReportRowSchema),
  byBench: z.array(groupReportRowSchema),
});
export type StrikeRateReport = z.infer<typeof strikeRateReportSchema>;

/** A stretch with more readings than this per quantity is read as bucket means (see `sampled`). */
export const REPORT_SAMPLES_PER_SERIES = 5000;

/**
 * GET /api/exports/batches.csv — the batches of reportQuerySchema, one row each, with the report's
 * figures; GET /api/exports/observations.csv — their observations, one row each (`batchId` for one
 * batch). Both UTF-8 with a byte-order mark, CRLF lines, units in the header, e.g.
 * "thickness (mm)", "strike rate (%)", "air.temperature inside window (% of time with data)".
 */
export const batchesCsvQuerySchema = reportQuerySchema;
export const observationsCsvQuerySchema = reportQuerySchema.extend({
  batchId: rowIdParamSchema.optional(),
  observedFrom: calendarDateSchema.optional(),
  observedTo: calendarDateSchema.optional(),
});
export type ObservationsCsvQuery = z.infer<typeof observationsCsvQuerySchema>;
