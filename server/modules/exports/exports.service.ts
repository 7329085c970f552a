import type { DataSource } from "typeorm";
import { celsiusToFahrenheit, isTemperature } from "../../../shared/domain/units.js";
import {
  EXPORT_INTERVAL_MS,
  MAX_RAW_EXPORT_MS,
  MAX_ROLLUP_EXPORT_MS,
  type ReadingsExportQuery,
} from "../../../shared/schemas/exports.js";
import { QUANTITIES, type Quantity } from "../../../shared/schemas/quantities.js";
import { MIN_READING_RETENTION_DAYS } from "../../config/env.js";
import { BenchEntity, type Bench } from "../../db/entities/bench.entity.js";
import { SiteEntity } from "../../db/entities/site.entity.js";
import { ZoneEntity, type Zone } from "../../db/entities/zone.entity.js";
import { Statements } from "../../db/statements.js";
import { AppError, notFound } from "../../lib/errors.js";
import { ROLLUP_RESOLUTIONS_MS } from "../readings/readings.repository.js";

const DAY_MS = 24 * 3600 * 1000;
const MINUTE_MS = 60_000;
/** The rollup resolutions kept at ingest, coarsest first: an export reads the coarsest that divides its interval. */
const COARSEST_FIRST_MS = [...ROLLUP_RESOLUTIONS_MS].reverse();
/** Raw rows are read six hours at a time, so memory stays small however long the range. */
const RAW_CHUNK_MS = 6 * 3600 * 1000;
/** Rolled-up rows are read this many buckets at a time. */
const ROLLUP_CHUNK_BUCKETS = 2000;

/** A CSV field (RFC 4180); text that a spreadsheet would run as a formula is prefixed with ' (OWASP CSV injection). */
export function csvField(value: string | number | null): string {
  if (value === null) return "";
  if (typeof value === "number") return String(value);
  const safe = /^[=+\-@\t\r]/.test(value) ? `'${value}` : value;
  return /[",\r\n]/.test(safe) ? `"${safe.replaceAll('"', '""')}"` : safe;
}

const csvLine = (fields: (string | number | null)[]) => fields.map(csvField).join(",") + "\r\n";

function slug(text: string): string {
  return (
    text
      .normalize("NFKD")
      .replace(/[^\w\s-]/g, "")
      .trim()
      .toLowerCase()
      .replace(/[\s_-]+/g, "-")
      .slice(0, 40) || "x"
  );
}

export interface CsvExport {
  filename: string;
  /** The file, piece by piece (the first piece holds the byte-order mark and the header). */
  chunks: AsyncGenerator<string>;
}

interface RawRow {
  sensorId: string;
  quantity: Quantity;
  timeMs: number;
  value: number;
}

interface BucketRow {
  bucket: number;
  quantity: Quantity;
  min: number;
  mean: number;
  max: number;
  n: number;
}

export interface ExportsOptions {
  /** Rebuilds rollup hours a back-dated probe move made stale, before rollups are read. */
  refreshRollups?: () => void | Promise<void>;
  /** READING_RETENTION_DAYS, named when a raw export asks for readings retention removed. */
  retentionDays?: number;
}

// quantity IN (…) lets the (bench_id, quantity, time_ms) index serve the time range.
const QUANTITY_LIST = QUANTITIES.map((q) => `'${q}'`).join(", ");

const EXPORT_SQL = {
  raw: `SELECT sensor_id AS "sensorId", quantity, time_ms AS "timeMs", value FROM reading
         WHERE bench_id = @benchId AND quantity IN (${QUANTITY_LIST}) AND time_ms >= @fromMs AND time_ms < @toMs`,
  // Buckets on UTC multiples of the interval, from the epoch-aligned rollups of the coarsest
  // resolution that divides it: integer division on both databases (the cast is for SQLite, where JS
  // numbers bind as REAL; STACK.md).
  buckets: `SELECT CAST(start_ms / @bucketMs AS INTEGER) AS bucket, quantity,
                   MIN(min) AS min, SUM(sum) / SUM(count) AS mean, MAX(max) AS max, SUM(count) AS n
              FROM reading_rollup
             WHERE bench_id = @benchId AND quantity IN (${QUANTITY_LIST}) AND resolution_ms = @resolutionMs AND start_ms >= @fromMs AND start_ms < @toMs
             GROUP BY bucket, quantity`,
  // Raw readings of a stretch against what its 1-minute rollups hold: fewer raw means retention
  // deleted some (a reading is stored with its rollups in one transaction).
  countRaw: `SELECT COUNT(*) AS n FROM reading WHERE bench_id = @benchId AND quantity IN (${QUANTITY_LIST}) AND time_ms >= @fromMs AND time_ms < @toMs`,
  countRolledUp: `SELECT COALESCE(SUM(count), 0) AS n FROM reading_rollup
                   WHERE bench_id = @benchId AND quantity IN (${QUANTITY_LIST}) AND resolution_ms = ${MINUTE_MS} AND start_ms >= @fromMs AND start_ms < @toMs`,
};

/**
 * CSV exports of stored readings (issue 7 §6), read in chunks: raw exports from the reading table,
 * rolled-up exports from the rollups (which outlive the raw readings, see modules/retention).
 */
export class ExportsService {
  private readonly sql: Statements<keyof typeof EXPORT_SQL>;

  constructor(
    private readonly dataSource: DataSource,
    private readonly now: () => number = Date.now,
    private readonly options: ExportsOptions = {},
  ) {
    this.sql = new Statements(dataSource, EXPORT_SQL);
  }

  /**
   * Refuses a raw export of a stretch whose raw readings retention has deleted, rather than
   * answering with a file that silently lacks them. Retention never deletes readings younger than
   * MIN_READING_RETENTION_DAYS, so only the part of the range older than that is checked.
   */
  private async assertRawKept(benches: Bench[], fromMs: number, toMs: number): Promise<void> {
    const checkFromMs = Math.floor(fromMs / MINUTE_MS) * MINUTE_MS;
    const checkToMs = Math.ceil(Math.min(toMs, this.now() - MIN_READING_RETENTION_DAYS * DAY_MS) / MINUTE_MS) * MINUTE_MS;
    if (checkFromMs >= checkToMs) return;
    await this.options.refreshRollups?.();
    let isPruned = false;
    for (const bench of benches) {
      const args = { benchId: bench.id, fromMs: checkFromMs, toMs: checkToMs };
      const rolledUp = (await this.sql.get<{ n: number }>("countRolledUp", args))!.n;
      const raw = (await this.sql.get<{ n: number }>("countRaw", args))!.n;
      if (rolledUp > raw) {
        isPruned = true;
        break;
      }
    }
    if (!isPruned) return;
    const days = this.options.retentionDays ?? 0;
    const kept = days > 0 ? `Raw readings are kept for ${days} days (READING_RETENTION_DAYS)` : "An earlier retention setting deleted raw readings of this range";
    const message = `${kept}; part of this range is kept only as 1-minute summaries. Export it at the 1-minute interval or longer.`;
    throw new AppError("raw-readings-not-kept", message, 400, [{ path: "interval", message }]);
  }

  async readingsCsv(query: ReadingsExportQuery): Promise<CsvExport> {
    const { zone, benches, timeZone, label } = await this.scope(query);
    const toMsAsked = query.to ?? this.now();
    const fromMsAsked = query.from ?? toMsAsked - DAY_MS;
    const raw = query.interval === "raw";
    if (toMsAsked - fromMsAsked > (raw ? MAX_RAW_EXPORT_MS : MAX_ROLLUP_EXPORT_MS)) {
      const message = raw ? "A raw export covers at most 31 days; choose an interval for a longer range" : "An export covers at most 400 days";
      throw new AppError("range-too-long", message, 400, [{ path: "from", message }]);
    }
    const bucketMs = raw ? 0 : EXPORT_INTERVAL_MS[query.interval as keyof typeof EXPORT_INTERVAL_MS];
    const fromMs = raw ? fromMsAsked : Math.floor(fromMsAsked / bucketMs) * bucketMs;
    const toMs = raw ? toMsAsked : Math.ceil(toMsAsked / bucketMs) * bucketMs;
    const resolutionMs = COARSEST_FIRST_MS.find((r) => bucketMs % r === 0) ?? MINUTE_MS;

    const unit = (q: Quantity): string => {
      if (isTemperature(q)) return query.temperatureUnit === "F" ? "°F" : "°C";
      if (q === "air.humidity") return "%RH";
      if (q === "medium.moisture") return query.moistureUnit === "percent" ? "% VWC" : "m³/m³";
      return "%EL";
    };
    const convert = (q: Quantity, v: number): number => {
      let out = v;
      if (isTemperature(q) && query.temperatureUnit === "F") out = celsiusToFahrenheit(v);
      else if (q === "medium.moisture" && query.moistureUnit === "percent") out = v * 100;
      return Number(out.toFixed(4));
    };
    const localTime = localTimeFormatter(timeZone);
    const timeColumns = (timeMs: number) => [new Date(timeMs).toISOString(), localTime(timeMs)];
    const header = raw
      ? ["time (UTC)", `time (${timeZone})`, "zone", "bench", "sensor", ...QUANTITIES.map((q) => `${q} (${unit(q)})`)]
      : ["time (UTC)", `time (${timeZone})`, "zone", "bench", ...QUANTITIES.flatMap((q) => [`${q} mean (${unit(q)})`, `${q} min (${unit(q)})`, `${q} max (${unit(q)})`, `${q} readings`])];

    if (raw) await this.assertRawKept(benches, fromMs, toMs);
    else await this.options.refreshRollups?.();

    const zoneName = new Map(zone.map((z) => [z.id, z.name]));
    const order = new Map(benches.map((b, i) => [b.id, i]));
    const sql = this.sql;

    async function* rawChunks(): AsyncGenerator<string> {
      for (let start = fromMs; start < toMs; start += RAW_CHUNK_MS) {
        const end = Math.min(toMs, start + RAW_CHUNK_MS);
        const rows: { timeMs: number; bench: Bench; sensorId: string; values: Map<Quantity, number> }[] = [];
        for (const bench of benches) {
          const byKey = new Map<string, (typeof rows)[number]>();
          for (const r of await sql.all<RawRow>("raw", { benchId: bench.id, fromMs: start, toMs: end })) {
            const key = `${r.timeMs}\u0000${r.sensorId}`;
            let row = byKey.get(key);
            if (!row) byKey.set(key, (row = { timeMs: r.timeMs, bench, sensorId: r.sensorId, values: new Map() }));
            row.values.set(r.quantity, r.value);
          }
          rows.push(...byKey.values());
        }
        rows.sort((a, b) => a.timeMs - b.timeMs || order.get(a.bench.id)! - order.get(b.bench.id)! || a.sensorId.localeCompare(b.sensorId));
        let text = "";
        for (const row of rows) {
          const values = QUANTITIES.map((q) => (row.values.has(q) ? convert(q, row.values.get(q)!) : null));
          text += csvLine([...timeColumns(row.timeMs), zoneName.get(row.bench.zoneId) ?? "", row.bench.name, row.sensorId, ...values]);
        }
        if (text) yield text;
      }
    }

    async function* rollupChunks(): AsyncGenerator<string> {
      const step = bucketMs * ROLLUP_CHUNK_BUCKETS;
      for (let start = fromMs; start < toMs; start += step) {
        const end = Math.min(toMs, start + step);
        const rows: { timeMs: number; bench: Bench; byQuantity: Map<Quantity, BucketRow> }[] = [];
        for (const bench of benches) {
          const byBucket = new Map<number, (typeof rows)[number]>();
          for (const r of await sql.all<BucketRow>("buckets", { benchId: bench.id, fromMs: start, toMs: end, bucketMs, resolutionMs })) {
            let row = byBucket.get(r.bucket);
            if (!row) byBucket.set(r.bucket, (row = { timeMs: r.bucket * bucketMs, bench, byQuantity: new Map() }));
            row.byQuantity.set(r.quantity, r);
          }
          rows.push(...byBucket.values());
        }
        rows.sort((a, b) => a.timeMs - b.timeMs || order.get(a.bench.id)! - order.get(b.bench.id)!);
        let text = "";
        for (const row of rows) {
          const values = QUANTITIES.flatMap((q) => {
            const b = row.byQuantity.get(q);
            return b ? [convert(q, b.mean), convert(q, b.min), convert(q, b.max), b.n] : [null, null, null, 0];
          });
          text += csvLine([...timeColumns(row.timeMs), zoneName.get(row.bench.zoneId) ?? "", row.bench.name, ...values]);
        }
        if (text) yield text;
      }
    }

    async function* all(): AsyncGenerator<string> {
      yield "\uFEFF" + csvLine(header);
      yield* raw ? rawChunks() : rollupChunks();
    }

    const day = (ms: number) => new Date(ms).toISOString().slice(0, 10);
    return { filename: `benchwarden-${label}-${day(fromMs)}-to-${day(toMs)}-${query.interval}.csv`, chunks: all() };
  }

  private async scope(query: ReadingsExportQuery): Promise<{ zone: Zone[]; benches: Bench[]; timeZone: string; label: string }> {
    let zone: Zone | null;
    let benches: Bench[];
    if (query.benchId !== undefined) {
      const bench = await this.dataSource.getRepository(BenchEntity).findOneBy({ id: query.benchId });
      if (!bench) throw notFound("bench-not-found", `There is no bench ${query.benchId}`);
      zone = await this.dataSource.getRepository(ZoneEntity).findOneBy({ id: bench.zoneId });
      benches = [bench];
    } else {
      zone = await this.dataSource.getRepository(ZoneEntity).findOneBy({ id: query.zoneId! });
      if (!zone) throw notFound("zone-not-found", `There is no zone ${query.zoneId}`);
      benches = await this.dataSource.getRepository(BenchEntity).find({ where: { zoneId: zone.id }, order: { position: "ASC", id: "ASC" } });
    }
    const site = zone ? await this.dataSource.getRepository(SiteEntity).findOneBy({ id: zone.siteId }) : null;
    const label = query.benchId !== undefined ? `${slug(zone?.name ?? "")}-${slug(benches[0]!.name)}` : slug(zone?.name ?? "");
    return { zone: zone ? [zone] : [], benches, timeZone: site?.timeZone ?? "UTC", label };
  }
}

/** "2025-01-15 00:00:00" in the site's time zone (UTC when the zone is not known to the platform). */
function localTimeFormatter(timeZone: string): (ms: number) => string {
  let format: Intl.DateTimeFormat;
  try {
    format = new Intl.DateTimeFormat("sv-SE", { timeZone, year: "numeric", month: "2-digit", day: "2-digit", hour: "2-digit", minute: "2-digit", second: "2-digit", hourCycle: "h23" });
  } catch {
    format = new Intl.DateTimeFormat("sv-SE", { timeZone: "UTC", year: "numeric", month: "2-digit", day: "2-digit", hour: "2-digit", minute: "2-digit", second: "2-digit", hourCycle: "h23" });
  }
  return (ms) => format.format(new Date(ms));
}
