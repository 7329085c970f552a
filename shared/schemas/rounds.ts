import { z } from "zod";
import { rowIdParamSchema, rowIdSchema } from "./ids.js";
import { alertSchema } from "./alerts.js";
import { batchStageSchema, batchTallySchema, observationFlagSchema, observationSummarySchema, observationViewSchema } from "./batches.js";
import { windowedQuantitySchema } from "./windows.js";

/*
 * The morning walk-through (issue 6 §3; PRODUCT.md §5): a round of one zone or of every zone of a
 * site, benches in walking order (zone position, then bench position — set on the layout pages),
 * one card per bench, each bench checked off, then finished → a summary saved and mailed to the
 * managers.
 *
 * Who may do what (the server enforces it): growers, managers and admins start, resume, check,
 * finish and abandon rounds; every signed-in role reads them.
 *
 * Rules:
 * - One unfinished round per scope. Starting a round whose scope already has one in progress
 *   resumes it (answer 200, `resumed: true`; 201 for a new round) — whoever started it: two people
 *   may share a round, and every check-off records who made it. A round in progress for longer
 *   than ROUND_STALE_AFTER_MS is abandoned when its scope is started again.
 * - Two people can walk different zones at once. A zone round and a whole-site round of the same
 *   site overlap: starting one while the other is in progress is refused (409 round-overlaps,
 *   naming who started it and when).
 * - Checking a bench off (PUT …/check) is idempotent: the first check-off's time and person stay;
 *   a later PUT may only change its note. DELETE …/check undoes it while the round is in progress.
 * - Finishing (POST …/finish) is idempotent too: a finished round answers with its saved summary
 *   and mails nobody again. Benches need not all be checked; the summary lists those that were not.
 *
 * Values are stored units (°C, % RH, ratio 0–1 for moisture, kPa for VPD); instants ms since 1970.
 */

const idSchema = rowIdSchema;

/** A round still in progress after this long is abandoned when its scope is started again. */
export const ROUND_STALE_AFTER_MS = 12 * 3600 * 1000;

/** A card looks back at most this far (a bench whose last round was long ago). */
export const MAX_CARD_LOOKBACK_MS = 7 * 24 * 3600 * 1000;

/** POST /api/rounds — `zoneId` for one zone; `siteId` for every zone of a site; neither: every zone of the only site. */
export const startRoundInputSchema = z
  .object({
    zoneId: idSchema.optional(),
    siteId: idSchema.optional(),
  })
  .refine((v) => !(v.zoneId !== undefined && v.siteId !== undefined), { message: "Give a zone or a site, not both", path: ["zoneId"] });
export type StartRoundInput = z.infer<typeof startRoundInputSchema>;

export const roundStatusSchema = z.enum(["in-progress", "finished", "abandoned"]);
export type RoundStatus = z.infer<typeof roundStatusSchema>;

const personSchema = z.object({ userId: z.number().int().nullable(), name: z.string() });

export const benchCheckSchema = z.object({
  atMs: z.number(),
  by: personSchema,
  note: z.string().nullable(),
});
export type BenchCheck = z.infer<typeof benchCheckSchema>;

/** A bench of the round, in walking order. */
export const roundBenchSchema = z.object({
  benchId: z.number().int(),
  benchName: z.string(),
  zoneId: z.number().int(),
  zoneName: z.string(),
  /** 0-based place in the round's walking order. */
  order: z.number().int(),
  /** null until checked off. */
  check: benchCheckSchema.nullable(),
});
export type RoundBench = z.infer<typeof roundBenchSchema>;

export const roundViewSchema = z.object({
  id: z.number().int(),
  siteId: z.number().int(),
  siteName: z.string(),
  timeZone: z.string(),
  /** null: every zone of the site. */
  zoneId: z.number().int().nullable(),
  zoneName: z.string().nullable(),
  /** "House 1 · Fig cuttings", or "All zones of Hollin Lane Nursery". */
  scopeLabel: z.string(),
  status: roundStatusSchema,
  startedAtMs: z.number(),
  startedBy: personSchema,
  finishedAtMs: z.number().nullable(),
  finishedBy: personSchema.nullable(),
  /** The benches in use in the scope (plus any archived since that were checked), in walking order. */
  benches: z.array(roundBenchSchema),
  benchCount: z.number().int(),
  checkedCount: z.number().int(),
});
export type RoundView = z.infer<typeof roundViewSchema>;

export const startRoundResponseSchema = z.object({ round: roundViewSchema, resumed: z.boolean() });
export type StartRoundResponse = z.infer<typeof startRoundResponseSchema>;

export const roundResponseSchema = z.object({ round: roundViewSchema });
export type RoundResponse = z.infer<typeof roundResponseSchema>;

/** GET /api/rounds — newest first. */
export const roundsQuerySchema = z.object({
  status: z.enum(["in-progress", "finished", "abandoned", "all"]).default("all"),
  siteId: rowIdParamSchema.optional(),
  /** Rounds of this zone, and whole-site rounds that covered it. */
  zoneId: rowIdParamSchema.optional(),
  limit: z.coerce.number().int().min(1).max(100).default(20),
});
export type RoundsQuery = z.infer<typeof roundsQuerySchema>;

export const roundsResponseSchema = z.object({ rounds: z.array(roundViewSchema) });
export type RoundsResponse = z.infer<typeof roundsResponseSchema>;

// ── bench cards ──────────────────────────────────────────────────────────────

const timedValueSchema = z.object({ value: z.number(), timeMs: z.number() });

/** One windowed quantity on a card: the period's extremes and minutes against the window in force now. */
export const quantityCardSchema = z.object({
  quantity: windowedQuantitySchema,
  /** Stored units; null when the bench has no window for it. */
  window: z.object({ min: z.number(), max: z.number() }).nullable(),
  /** Lowest and highest reading in the period (exact); null without readings. */
  min: timedValueSchema.nullable(),
  max: timedValueSchema.nullable(),
  readingCount: z.number().int(),
  /** Minutes inside, below, above the window and without data; they add up to the period. Without a window, all time with data counts as inside. */
  minutes: z.object({ inside: z.number(), below: z.number(), above: z.number(), noData: z.number() }),
  /** below + above, rounded to whole minutes: the card's headline figure. */
  minutesOutOfWindow: z.number().int(),
  /** Inside as a share of the time with data, 0–100; null without data. */
  insidePct: z.number().nullable(),
  /** True when the period held too many readings and minutes were counted on one-minute-or-longer bucket means. */
  sampled: z.boolean(),
});
export type QuantityCard = z.infer<typeof quantityCardSchema>;

/** Dew point and VPD from paired air temperature and humidity readings (one probe, one time). */
export const airMoistureCardSchema = z.object({
  pairCount: z.number().int(),
  /** °C; null without pairs. */
  dewPointC: z.object({ min: timedValueSchema, max: timedValueSchema }).nullable(),
  /** kPa. */
  vpdKPa: z.object({ min: timedValueSchema, max: timedValueSchema }).nullable(),
  /** Smallest air − dew point, °C (condensation risk when small; the bench's margin beside it). */
  dewPointMarginC: z.object({ min: timedValueSchema, alertMarginC: z.number() }).nullable(),
});
export type AirMoistureCard = z.infer<typeof airMoistureCardSchema>;

export const cardBatchSchema = z.object({
  id: z.number().int(),
  variety: z.string(),
  stuckOn: z.string(),
  ageDays: z.number().int(),
  countStuck: z.number().int(),
  stage: batchStageSchema,
  tally: batchTallySchema,
  lastObservation: observationSummarySchema.nullable(),
  /** Observations of this batch recorded in this round (so a resumed round shows what is done). */
  observationsThisRound: z.array(observationViewSchema),
});
export type CardBatch = z.infer<typeof cardBatchSchema>;

/**
 * GET /api/rounds/:id/cards (every bench) and GET /api/rounds/:id/benches/:benchId/card (one).
 * The period runs from the bench's check-off in the last finished round that checked it (or 18:00
 * the day before the round started, site time, when there is none; at most MAX_CARD_LOOKBACK_MS
 * back) to its check-off in this round, or now while unchecked.
 */
export const benchCardSchema = z.object({
  roundId: z.number().int(),
  benchId: z.number().int(),
  benchName: z.string(),
  zoneId: z.number().int(),
  zoneName: z.string(),
  order: z.number().int(),
  period: z.object({
    fromMs: z.number(),
    toMs: z.number(),
    since: z.enum(["last-round", "evening-before"]),
    /** The finished round the period starts from (since "last-round"). */
    sinceRoundId: z.number().int().nullable(),
    /** True when the start was pulled forward to MAX_CARD_LOOKBACK_MS before the end. */
    capped: z.boolean(),
  }),
  quantities: z.array(quantityCardSchema),
  air: airMoistureCardSchema,
  /** Alerts of the bench open at any time in the period, oldest first. */
  alerts: z.array(alertSchema),
  /** Open batches on the bench now. */
  batches: z.array(cardBatchSchema),
  check: benchCheckSchema.nullable(),
});
export type BenchCard = z.infer<typeof benchCardSchema>;

export const roundCardsResponseSchema = z.object({ round: roundViewSchema, cards: z.array(benchCardSchema) });
export type RoundCardsResponse = z.infer<typeof roundCardsResponseSchema>;

export const benchCardResponseSchema = z.object({ card: benchCardSchema });
export type BenchCardResponse = z.infer<typeof benchCardResponseSchema>;

/** PUT /api/rounds/:id/benches/:benchId/check */
export const checkBenchInputSchema = z.object({
  /**
   * When the grower tapped it on the tablet. A check-off made offline is sent later; without this
   * it would carry the time it reached the server. Kept between the round's start and now.
   */
  checkedAtMs: z.number().int().positive().optional(),
  note: z
    .string()
    .trim()
    .max(1000, "Use at most 1000 characters")
    .nullable()
    .transform((v) => (v === "" ? null : v))
    .optional(),
});
export type CheckBenchInput = z.infer<typeof checkBenchInputSchema>;

/** Answer of the check-off PUT/DELETE: the bench's entry and the round as it is now. */
export const checkBenchResponseSchema = z.object({ bench: roundBenchSchema, round: roundViewSchema });
export type CheckBenchResponse = z.infer<typeof checkBenchResponseSchema>;

// ── summary ──────────────────────────────────────────────────────────────────

export const summaryQuantitySchema = z.object({
  quantity: windowedQuantitySchema,
  readingCount: z.number().int(),
  belowMinutes: z.number().int(),
  aboveMinutes: z.number().int(),
  /** Minutes of the period without data (before the first reading, or silences longer than the sensor-silent delay). */
  noDataMinutes: z.number().int(),
  min: z.number().nullable(),
  max: z.number().nullable(),
  windowMin: z.number().nullable(),
  windowMax: z.number().nullable(),
});
export type SummaryQuantity = z.infer<typeof summaryQuantitySchema>;

export const summaryBenchSchema = z.object({
  benchId: z.number().int(),
  benchName: z.string(),
  zoneName: z.string(),
  check: benchCheckSchema.nullable(),
  /** The card's period as it was at check-off; null for a bench not checked. */
  period: z.object({ fromMs: z.number(), toMs: z.number() }).nullable(),
  /** Every windowed quantity as the card had it at check-off (empty for a bench not checked). */
  quantities: z.array(summaryQuantitySchema),
  /** The quantities with any time out of window in the period (a subset of `quantities`). */
  outOfWindow: z.array(summaryQuantitySchema),
  alertIds: z.array(z.number().int()),
});

export const summaryAlertSchema = z.object({
  alertId: z.number().int(),
  benchId: z.number().int(),
  benchName: z.string(),
  zoneName: z.string(),
  summary: z.string(),
  phase: z.string(),
  sinceMs: z.number(),
  clearedAtMs: z.number().nullable(),
  quantity: z.string().nullable(),
  worstValue: z.number().nullable(),
});

export const summaryObservationSchema = z.object({
  observationId: z.number().int(),
  batchId: z.number().int(),
  variety: z.string(),
  benchId: z.number().int(),
  benchName: z.string(),
  zoneName: z.string(),
  stage: batchStageSchema,
  flags: z.array(observationFlagSchema),
  note: z.string().nullable(),
  photoCount: z.number().int(),
});

/**
 * What a finished round found (saved with it, shown, and mailed to the managers). Problems are the
 * alerts of the checked benches' cards and the observations of the round that carry a flag.
 * Observations of the round: those sent with its roundId, and those recorded without one on a
 * batch in its scope while it was in progress.
 */
export const roundSummarySchema = z.object({
  roundId: z.number().int(),
  siteName: z.string(),
  scopeLabel: z.string(),
  timeZone: z.string(),
  startedAtMs: z.number(),
  startedBy: personSchema,
  finishedAtMs: z.number(),
  finishedBy: personSchema,
  /** Everyone who checked a bench or recorded an observation in the round, by name. */
  walkedBy: z.array(z.string()),
  benchCount: z.number().int(),
  checkedCount: z.number().int(),
  benches: z.array(summaryBenchSchema),
  notChecked: z.array(z.object({ benchId: z.number().int(), benchName: z.string(), zoneName: z.string() })),
  problems: z.object({
    count: z.number().int(),
    alerts: z.array(summaryAlertSchema),
    observations: z.array(summaryObservationSchema),
  }),
  observationCount: z.number().int(),
  photoCount: z.number().int(),
  /** Who the summary was mailed to (addresses). */
  mailedTo: z.array(z.string()),
});
export type RoundSummary = z.infer<typeof roundSummarySchema>;

/** Answer of POST /api/rounds/:id/finish and GET /api/rounds/:id/summary. */
export const roundSummaryResponseSchema = z.object({ round: roundViewSchema, summary: roundSummarySchema });
export type RoundSummaryResponse = z.infer<typeof roundSummaryResponseSchema>;
