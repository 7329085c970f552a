import { z } from "zod";
import { rowIdParamSchema, rowIdSchema } from "./ids.js";
import { describeDurationS } from "../domain/duration.js";

export const alertKindSchema = z.enum(["window", "condensation", "sensor-silent"]);
export type AlertKind = z.infer<typeof alertKindSchema>;

/** The life-cycle names of PRODUCT.md §3. */
export const alertPhaseSchema = z.enum(["watching", "raised", "acknowledged", "cleared"]);
export type AlertPhase = z.infer<typeof alertPhaseSchema>;

export const alertSchema = z.object({
  id: z.number().int(),
  kind: alertKindSchema,
  phase: alertPhaseSchema,
  benchId: z.number().int(),
  benchName: z.string(),
  zoneId: z.number().int(),
  zoneName: z.string(),
  siteName: z.string(),
  /** For kind "window": the quantity out of window. */
  quantity: z.string().nullable(),
  direction: z.enum(["below", "above"]).nullable(),
  sensorId: z.string().nullable(),
  /** Stored units (°C, %RH, ratio; °C of dew-point margin for condensation). */
  lastValue: z.number().nullable(),
  worstValue: z.number().nullable(),
  /** The window in force when the alert was last evaluated, stored units. */
  windowMin: z.number().nullable(),
  windowMax: z.number().nullable(),
  sinceMs: z.number(),
  raisedAtMs: z.number().nullable(),
  acknowledgedAtMs: z.number().nullable(),
  acknowledgedByName: z.string().nullable(),
  acknowledgeNote: z.string().nullable(),
  clearedAtMs: z.number().nullable(),
  escalatedAtMs: z.number().nullable(),
  /** A plain sentence, e.g. "Air too cold". */
  summary: z.string(),
});
export type AlertView = z.infer<typeof alertSchema>;

/** GET /api/alerts */
export const alertsQuerySchema = z.object({
  status: z.enum(["open", "past", "all"]).default("open"),
  zoneId: rowIdParamSchema.optional(),
  kind: alertKindSchema.optional(),
  phase: alertPhaseSchema.optional(),
  benchId: rowIdParamSchema.optional(),
  /** Alerts that were open at some time in [fromMs, toMs) (ms since 1970). */
  fromMs: z.coerce.number().int().min(0).optional(),
  toMs: z.coerce.number().int().min(0).optional(),
  limit: z.coerce.number().int().min(1).max(500).default(100),
});
export type AlertsQuery = z.infer<typeof alertsQuerySchema>;

export const alertsResponseSchema = z.object({ alerts: z.array(alertSchema) });

/** POST /api/alerts/:id/acknowledge, POST /api/ack-links/:token */
export const acknowledgeInputSchema = z.object({
  note: z.string().trim().max(500, "Use at most 500 characters").optional(),
});
export type AcknowledgeInput = z.infer<typeof acknowledgeInputSchema>;

/** GET /api/ack-links/:token: what the acknowledge page shows; reading it changes nothing. */
export const ackLinkResponseSchema = z.object({
  recipientName: z.string(),
  /** The recipient's own °F/°C, so the page shows what the mail showed. */
  recipientUnit: z.enum(["F", "C"]).default("F"),
  expiresAtMs: z.number(),
  alerts: z.array(alertSchema),
  /** False when every alert of the link is already acknowledged or cleared. */
  canAcknowledge: z.boolean(),
});
export type AckLinkResponse = z.infer<typeof ackLinkResponseSchema>;

const minuteOfDay = z.number().int().min(0).max(24 * 60);

/** A duty shift, as the rota page edits it. */
export const dutyShiftInputSchema = z
  .object({
    zoneId: rowIdSchema.nullable(),
    userId: rowIdSchema,
    /** Bit 0 = Sunday … bit 6 = Saturday. */
    weekdays: z.number().int().min(1, "Choose at least one day").max(127),
    startMinute: minuteOfDay,
    endMinute: minuteOfDay,
    isFallback: z.boolean().default(false),
  })
  .refine((s) => s.isFallback || s.startMinute !== s.endMinute, { message: "A shift needs a start and an end", path: ["endMinute"] });
export type DutyShiftInput = z.infer<typeof dutyShiftInputSchema>;

export const dutyShiftSchema = z.object({
  id: z.number().int(),
  zoneId: z.number().int().nullable(),
  zoneName: z.string().nullable(),
  userId: z.number().int(),
  userName: z.string(),
  weekdays: z.number().int(),
  startMinute: z.number().int(),
  endMinute: z.number().int(),
  isFallback: z.boolean(),
});
export type DutyShift = z.infer<typeof dutyShiftSchema>;

/**
 * How long a raised alert may go unacknowledged before the managers are mailed, and how often the
 * person on duty is reminded meanwhile, per site (PRODUCT.md §5). Seconds, in whole minutes.
 * Shorter than these and a night-shift worker walking to the greenhouse would be escalated over;
 * longer and a dead heater goes a whole night unnoticed.
 */
export const ALERT_TIMING_LIMITS_S = {
  escalateAfterS: { min: 5 * 60, max: 12 * 3600 },
  renotifyEveryS: { min: 10 * 60, max: 12 * 3600 },
} as const;

function timingSeconds({ min, max }: { min: number; max: number }) {
  const range = `Choose between ${describeDurationS(min)} and ${describeDurationS(max)}`;
  return z
    .number({ error: "Enter a number of minutes" })
    .int("Use whole minutes")
    .multipleOf(60, "Use whole minutes")
    .min(min, range)
    .max(max, range)
    .nullable();
}

/** PUT /api/sites/:id/alert-timing (admin, manager): null = the server's default (ALERT_ESCALATE_AFTER, ALERT_RENOTIFY_EVERY). */
export const siteAlertTimingInputSchema = z.object({
  escalateAfterS: timingSeconds(ALERT_TIMING_LIMITS_S.escalateAfterS),
  renotifyEveryS: timingSeconds(ALERT_TIMING_LIMITS_S.renotifyEveryS),
});
export type SiteAlertTimingInput = z.infer<typeof siteAlertTimingInputSchema>;

/** One site's alert timing: its own settings (null = the default) and the server's defaults. */
export const siteAlertTimingSchema = z.object({
  siteId: z.number().int(),
  siteName: z.string(),
  escalateAfterS: z.number().int().nullable(),
  renotifyEveryS: z.number().int().nullable(),
  defaultEscalateAfterS: z.number(),
  defaultRenotifyEveryS: z.number(),
});
export type SiteAlertTiming = z.infer<typeof siteAlertTimingSchema>;

export const siteAlertTimingResponseSchema = z.object({ alertTiming: siteAlertTimingSchema });

export const dutyRotaResponseSchema = z.object({
  shifts: z.array(dutyShiftSchema),
  /** Who would be mailed right now, per zone. */
  onDutyNow: z.array(z.object({ zoneId: z.number().int(), zoneName: z.string(), users: z.array(z.object({ id: z.number().int(), name: z.string() })) })),
  timeZone: z.string(),
  /** Per site in use: when the managers are told and how often the person on duty is reminded. */
  alertTiming: z.array(siteAlertTimingSchema),
});
export type DutyRotaResponse = z.infer<typeof dutyRotaResponseSchema>;

/** GET /api/duty-rota/candidates: who may be put on duty (active users who can acknowledge). */
export const dutyCandidatesResponseSchema = z.object({
  users: z.array(z.object({ id: z.number().int(), name: z.string(), role: z.enum(["admin", "manager", "grower"]) })),
});

/** SSE event "alerts" on /api/stream: alerts that changed. */
export const alertsEventSchema = z.object({ alerts: z.array(alertSchema) });
