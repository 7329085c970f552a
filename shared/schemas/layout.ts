import { z } from "zod";
import { rowIdSchema } from "./ids.js";
import { sensorKindSchema } from "./quantities.js";

/*
 * The nursery's layout: sites → zones → benches (issue 7 §1). Nothing is ever deleted: archiving
 * hides a site, zone or bench from the dashboard and the forms, keeps its readings, windows,
 * audit and assignment history, and can be undone (restore).
 *
 * Who may change what (the server enforces it): sites and zones — admin; benches (create, edit,
 * move, order, archive) — admin and manager; reading — every signed-in role.
 */

const idSchema = rowIdSchema;

export const layoutNameSchema = z.string().trim().min(1, "Enter a name").max(120, "Use at most 120 characters");

/** An IANA time zone such as "America/Chicago" (checked with the platform's Intl, on both sides). */
export const timeZoneSchema = z
  .string()
  .trim()
  .min(1, "Choose a time zone")
  .max(64)
  .refine(
    (tz) => {
      try {
        new Intl.DateTimeFormat("en-US", { timeZone: tz });
        return true;
      } catch {
        return false;
      }
    },
    { message: "Choose a time zone such as America/Chicago" },
  );

/** Place in the walking order (zones within a site, benches within a zone), 0 first. */
export const positionSchema = z.number().int("Use a whole number").min(0).max(10_000);

export const siteViewSchema = z.object({
  id: z.number().int(),
  name: z.string(),
  timeZone: z.string(),
  createdAtMs: z.number(),
  /** When it was archived; null while in use. */
  archivedAtMs: z.number().nullable(),
});
export type SiteView = z.infer<typeof siteViewSchema>;

export const zoneViewSchema = z.object({
  id: z.number().int(),
  siteId: z.number().int(),
  name: z.string(),
  position: z.number().int(),
  archivedAtMs: z.number().nullable(),
});
export type ZoneView = z.infer<typeof zoneViewSchema>;

export const benchViewSchema = z.object({
  id: z.number().int(),
  zoneId: z.number().int(),
  name: z.string(),
  position: z.number().int(),
  archivedAtMs: z.number().nullable(),
  /** Sensors assigned to the bench now. */
  sensors: z.array(z.object({ id: z.string(), kind: sensorKindSchema })),
  /** True when the bench overrides any of its zone's windows or the dew-point margin. */
  hasWindowOverrides: z.boolean(),
});
export type BenchView = z.infer<typeof benchViewSchema>;

/** Query of GET /api/layout: `includeArchived=true` lists archived items too. */
export const layoutQuerySchema = z.object({
  includeArchived: z
    .enum(["true", "false", "1", "0"])
    .optional()
    .transform((v) => v === "true" || v === "1"),
});

/**
 * GET /api/layout — every site, zone and bench (flat lists, each in walking order), for the
 * settings pages. Archive/restore answer with the same shape holding the items they changed.
 */
export const layoutResponseSchema = z.object({
  sites: z.array(siteViewSchema),
  zones: z.array(zoneViewSchema),
  benches: z.array(benchViewSchema),
});
export type LayoutResponse = z.infer<typeof layoutResponseSchema>;

/** POST /api/sites (admin) */
export const createSiteInputSchema = z.object({ name: layoutNameSchema, timeZone: timeZoneSchema });
export type CreateSiteInput = z.infer<typeof createSiteInputSchema>;

/** PATCH /api/sites/:id (admin) */
export const updateSiteInputSchema = z
  .object({ name: layoutNameSchema.optional(), timeZone: timeZoneSchema.optional() })
  .refine((v) => v.name !== undefined || v.timeZone !== undefined, { message: "Nothing to change" });
export type UpdateSiteInput = z.infer<typeof updateSiteInputSchema>;

/**
 * POST /api/zones (admin). The new zone's windows start from a preset (default "warm-rooting",
 * see shared/domain/window-guidance.ts); `presetId: null` starts with no windows (nothing watched).
 * `position` defaults to after the site's last zone.
 */
export const createZoneInputSchema = z.object({
  siteId: idSchema,
  name: layoutNameSchema,
  position: positionSchema.optional(),
  presetId: z.string().trim().min(1).nullable().optional(),
});
export type CreateZoneInput = z.infer<typeof createZoneInputSchema>;

/** PATCH /api/zones/:id (admin). A zone stays on its site. */
export const updateZoneInputSchema = z
  .object({ name: layoutNameSchema.optional(), position: positionSchema.optional() })
  .refine((v) => v.name !== undefined || v.position !== undefined, { message: "Nothing to change" });
export type UpdateZoneInput = z.infer<typeof updateZoneInputSchema>;

/** POST /api/benches (admin, manager). `position` defaults to after the zone's last bench. */
export const createBenchInputSchema = z.object({ zoneId: idSchema, name: layoutNameSchema, position: positionSchema.optional() });
export type CreateBenchInput = z.infer<typeof createBenchInputSchema>;

/**
 * PATCH /api/benches/:id (admin, manager). Moving a bench to another zone (`zoneId`) keeps its
 * readings and overrides; from then on it follows the new zone's windows.
 */
export const updateBenchInputSchema = z
  .object({ name: layoutNameSchema.optional(), position: positionSchema.optional(), zoneId: idSchema.optional() })
  .refine((v) => v.name !== undefined || v.position !== undefined || v.zoneId !== undefined, { message: "Nothing to change" });
export type UpdateBenchInput = z.infer<typeof updateBenchInputSchema>;

/** PUT /api/zones/:id/bench-order (admin, manager): every live bench of the zone, in walking order. */
export const benchOrderInputSchema = z.object({
  benchIds: z
    .array(idSchema)
    .min(1)
    .refine((ids) => new Set(ids).size === ids.length, { message: "A bench appears twice" }),
});
export type BenchOrderInput = z.infer<typeof benchOrderInputSchema>;

/** POST …/:id responses for create and edit. */
export const siteResponseSchema = z.object({ site: siteViewSchema });
export const zoneResponseSchema = z.object({ zone: zoneViewSchema });
export const benchResponseSchema = z.object({ bench: benchViewSchema });

// ── sensor assignment history ──────────────────────────────────────────────

/**
 * One stretch of time a sensor spent on a bench: from `fromMs` (inclusive) to `toMs` (exclusive;
 * null while it is still there). Readings taken in the stretch belong to that bench.
 */
export const sensorAssignmentSchema = z.object({
  id: z.number().int(),
  sensorId: z.string(),
  benchId: z.number().int(),
  benchName: z.string(),
  zoneId: z.number().int(),
  zoneName: z.string(),
  fromMs: z.number(),
  toMs: z.number().nullable(),
});
export type SensorAssignment = z.infer<typeof sensorAssignmentSchema>;

/** GET /api/benches/:id/assignments, GET /api/sensors/:id/assignments: newest first. */
export const sensorAssignmentsResponseSchema = z.object({ assignments: z.array(sensorAssignmentSchema) });
export type SensorAssignmentsResponse = z.infer<typeof sensorAssignmentsResponseSchema>;

/** How far back a move may be dated: 7 days (readings older than that are not re-filed). */
export const MAX_ASSIGNMENT_BACKDATE_MS = 7 * 24 * 3600 * 1000;

/**
 * POST /api/sensors/:id/assignments (admin): put a sensor on a bench (or take it off: null) as of
 * `fromMs` (default now). A move dated in the past re-files the sensor's readings since then onto
 * the new bench; it may not reach before the current assignment began, nor more than 7 days back.
 */
export const assignSensorInputSchema = z.object({
  benchId: idSchema.nullable(),
  fromMs: z.number().int().positive().optional(),
});
export type AssignSensorInput = z.infer<typeof assignSensorInputSchema>;

export const assignSensorResponseSchema = z.object({
  assignments: z.array(sensorAssignmentSchema),
  /** Readings moved to the new bench by a move dated in the past. */
  readingsRefiled: z.number().int(),
});
export type AssignSensorResponse = z.infer<typeof assignSensorResponseSchema>;
