import { z } from "zod";
import { rowIdParamSchema } from "./ids.js";
import { roleSchema } from "./auth.js";
import { windowedQuantitySchema } from "./windows.js";

/*
 * The audit trail (issue 7 §4): every change to the layout, windows, presets, sensor assignments
 * and the duty rota — who, when, old → new. Values are stored units (SI) like everywhere else;
 * `kind` tells the client how to show them in the reader's units.
 */

/** What was changed. */
export const auditEntityTypeSchema = z.enum([
  "site",
  "zone",
  "bench",
  /** A zone's window set (windows + dew-point margin). */
  "zone-windows",
  /** A bench's overrides. */
  "bench-windows",
  "window-preset",
  "sensor-assignment",
  /** A sensor's offset and gain per quantity. */
  "sensor-calibration",
  "duty-rota",
  /** A batch of cuttings (issue 6): created, edited, moved, closed, reopened. */
  "batch",
]);
export type AuditEntityType = z.infer<typeof auditEntityTypeSchema>;

export const auditActionSchema = z.enum([
  "created",
  "updated",
  "archived",
  "restored",
  "deleted",
  /** Windows replaced by a preset's (the entry's `note` names it). */
  "preset-applied",
  /** Benches put in a new walking order. */
  "reordered",
  /** A sensor put on a bench, moved, or taken off one. */
  "assigned",
  /** A batch moved to another bench (benchId old → new; the note says from when). */
  "moved",
  /** A batch closed with an outcome, or reopened. */
  "closed",
  "reopened",
]);
export type AuditAction = z.infer<typeof auditActionSchema>;

/**
 * How to read a change's values:
 * text, number, boolean as they are; time — ms since 1970 (UTC); duration — seconds;
 * temperature — °C; temperature-difference — °C difference (× 1.8 for °F, no offset);
 * humidity — % RH; moisture — ratio 0–1 (× 100 for % VWC); reference — the id of another
 * record, with its name in oldLabel / newLabel.
 */
export const auditValueKindSchema = z.enum([
  "text",
  "number",
  "boolean",
  "time",
  "duration",
  "temperature",
  "temperature-difference",
  "humidity",
  "moisture",
  "reference",
]);
export type AuditValueKind = z.infer<typeof auditValueKindSchema>;

export const auditValueSchema = z.union([z.string(), z.number(), z.boolean(), z.null()]);
export type AuditValue = z.infer<typeof auditValueSchema>;

/** One field, old → new. `old` null: it did not exist before; `new` null: it no longer exists. */
export const auditChangeSchema = z.object({
  /** The field's name, e.g. "name", "min", "delayS", "dewPointMarginC", "benchId". */
  field: z.string(),
  /** For window fields: the quantity. */
  quantity: windowedQuantitySchema.nullable(),
  kind: auditValueKindSchema,
  old: auditValueSchema,
  new: auditValueSchema,
  oldLabel: z.string().nullable(),
  newLabel: z.string().nullable(),
});
export type AuditChange = z.infer<typeof auditChangeSchema>;

export const auditEntrySchema = z.object({
  id: z.number().int(),
  atMs: z.number(),
  /** Who did it, as they were called then; userId null for the system itself. */
  actor: z.object({ userId: z.number().int().nullable(), name: z.string(), role: roleSchema.nullable() }),
  entityType: auditEntityTypeSchema,
  entityId: z.string(),
  action: auditActionSchema,
  /** What it is, in words, e.g. "House 1 · Fig cuttings › Bench 2". */
  subject: z.string(),
  siteId: z.number().int().nullable(),
  /** The zone the change belongs to (for a move: the zone it moved to). */
  zoneId: z.number().int().nullable(),
  /** For a bench or sensor that moved between zones: the zone it left. */
  previousZoneId: z.number().int().nullable(),
  benchId: z.number().int().nullable(),
  changes: z.array(auditChangeSchema),
  /** A plain sentence where the changes alone do not say it, e.g. "Preset “Warm rooting” applied". */
  note: z.string().nullable(),
});
export type AuditEntry = z.infer<typeof auditEntrySchema>;

/**
 * GET /api/audit (and GET /api/zones/:id/audit): newest first. Filters combine; `zoneId` also
 * matches entries that moved something out of the zone. Page with `before` = the previous page's
 * `nextBefore`.
 */
export const auditQuerySchema = z.object({
  zoneId: rowIdParamSchema.optional(),
  siteId: rowIdParamSchema.optional(),
  benchId: rowIdParamSchema.optional(),
  entityType: auditEntityTypeSchema.optional(),
  before: rowIdParamSchema.optional(),
  limit: z.coerce.number().int().min(1).max(200).default(50),
});
export type AuditQuery = z.infer<typeof auditQuerySchema>;

export const auditResponseSchema = z.object({
  entries: z.array(auditEntrySchema),
  /** Pass as `before` for the next (older) page; null on the last page. */
  nextBefore: z.number().int().nullable(),
});
export type AuditResponse = z.infer<typeof auditResponseSchema>;
