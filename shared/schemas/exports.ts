import { z } from "zod";
import { rowIdParamSchema } from "./ids.js";
import { temperatureUnitSchema } from "./auth.js";

/** Roll-up intervals of a readings export; "raw" is every stored reading. */
export const EXPORT_INTERVALS = ["raw", "1m", "5m", "15m", "30m", "1h"] as const;
export const exportIntervalSchema = z.enum(EXPORT_INTERVALS);
export type ExportInterval = z.infer<typeof exportIntervalSchema>;

export const EXPORT_INTERVAL_MS: Record<Exclude<ExportInterval, "raw">, number> = {
  "1m": 60_000,
  "5m": 300_000,
  "15m": 900_000,
  "30m": 1_800_000,
  "1h": 3_600_000,
};

/** The longest range of one export: 31 days raw, 400 days rolled up. */
export const MAX_RAW_EXPORT_MS = 31 * 24 * 3600 * 1000;
export const MAX_ROLLUP_EXPORT_MS = 400 * 24 * 3600 * 1000;

/** ISO 8601 or milliseconds since 1970. */
const instant = z.union([z.coerce.number().int().positive(), z.iso.datetime({ offset: true }), z.iso.date()]).transform((v) => (typeof v === "number" ? v : Date.parse(v)));

/**
 * GET /api/exports/readings.csv — readings of one bench (`benchId`) or one zone (`zoneId`, all its
 * benches, archived ones included) over [from, to) (default: the last 24 h), raw or rolled up.
 *
 * The answer is text/csv (UTF-8 with a byte-order mark, so spreadsheets read °, ³ right), one
 * header line, then rows in time order (then bench walking order). Units are in the header:
 * temperatures in `temperatureUnit` (default C), humidity % RH, moisture as `moistureUnit`
 * (ratio m³/m³, default, or percent % VWC), battery %EL. Columns:
 * - raw: `time (UTC)`, `time (<site time zone>)`, `zone`, `bench`, `sensor`, then one column per
 *   quantity, e.g. `air.temperature (°C)`; a row per sensor and time.
 * - rolled up: the same without `sensor`, and per quantity `<q> mean (unit)`, `<q> min (unit)`,
 *   `<q> max (unit)`, `<q> readings` (how many readings the bucket holds); a row per bench and
 *   bucket with data. Buckets are aligned to UTC multiples of the interval; the range is widened
 *   to whole buckets.
 */
export const readingsExportQuerySchema = z
  .object({
    benchId: rowIdParamSchema.optional(),
    zoneId: rowIdParamSchema.optional(),
    from: instant.optional(),
    to: instant.optional(),
    interval: exportIntervalSchema.default("raw"),
    temperatureUnit: temperatureUnitSchema.default("C"),
    moistureUnit: z.enum(["ratio", "percent"]).default("ratio"),
  })
  .superRefine((q, ctx) => {
    if ((q.benchId === undefined) === (q.zoneId === undefined)) {
      ctx.addIssue({ code: "custom", path: ["benchId"], message: "Choose a bench or a zone" });
    }
    if (q.from !== undefined && Number.isNaN(q.from)) ctx.addIssue({ code: "custom", path: ["from"], message: "Not a valid time" });
    if (q.to !== undefined && Number.isNaN(q.to)) ctx.addIssue({ code: "custom", path: ["to"], message: "Not a valid time" });
    if (q.from !== undefined && q.to !== undefined && !(q.from < q.to)) {
      ctx.addIssue({ code: "custom", path: ["from"], message: "'from' must be before 'to'" });
    }
  });
export type ReadingsExportQuery = z.infer<typeof readingsExportQuerySchema>;
