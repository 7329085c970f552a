import { In, type DataSource } from "typeorm";
import { pooledInsidePct, pooledStrikeRate, summariseDays } from "../../../shared/domain/batch.js";
import {
  BASE_TREATMENT_LABELS,
  FLAG_LABELS,
  MAX_REPORT_BATCHES,
  OUTCOME_LABELS,
  REPORT_SAMPLES_PER_SERIES,
  STAGE_LABELS,
  WRAPPING_LABELS,
  type BatchReportRow,
  type BatchView,
  type GroupReportRow,
  type ObservationFlag,
  type ObservationsCsvQuery,
  type QuantityTimeInWindow,
  type ReportQuery,
  type StrikeRateReport,
} from "../../../shared/schemas/batches.js";
import { WINDOWED_QUANTITIES, type WindowedQuantity } from "../../../shared/schemas/quantities.js";
import type { BatchRecord } from "../../db/entities/batch.entity.js";
import { ObservationEntity, ObservationPhotoEntity } from "../../db/entities/observation.entity.js";
import { AppError } from "../../lib/errors.js";
import { lifeEndMs, splitList, type BatchesService } from "../batches/batches.service.js";
import { csvField } from "../exports/exports.service.js";
import type { WindowsService } from "../windows/windows.service.js";
import type { BenchEnvironment } from "./bench-environment.js";

const MINUTE_MS = 60_000;
/** The most observation rows one CSV carries. */
const MAX_OBSERVATION_ROWS = 100_000;

const csvLine = (fields: (string | number | null)[]) => fields.map(csvField).join(",") + "\r\n";
const round1 = (n: number) => Math.round(n * 10) / 10;
const pct = (ratio: number | null) => (ratio === null ? null : round1(ratio * 100));

/** Time in window of one quantity over a batch's life, with the raw ms the groups pool. */
interface QuantityTotals {
  view: QuantityTimeInWindow;
  insideMs: number;
  dataMs: number;
  hasWindow: boolean;
}

interface ComputedRow {
  row: BatchReportRow;
  totals: Map<WindowedQuantity, QuantityTotals>;
}

export interface CsvFile {
  filename: string;
  text: string;
}

function localTime(ms: number, timeZone: string): string {
  try {
    return new Intl.DateTimeFormat("sv-SE", { timeZone, year: "numeric", month: "2-digit", day: "2-digit", hour: "2-digit", minute: "2-digit", second: "2-digit", hourCycle: "h23" }).format(ms);
  } catch {
    return new Date(ms).toISOString();
  }
}

/**
 * Strike-rate reports (issue 6 §6): per batch, per variety and per bench — strike rate, days to
 * callus and roots, and the share of its life the bench was inside its window — and the CSV
 * exports of batches and observations. Time in window runs over the readings of each bench the
 * batch sat on (BenchEnvironment: bounded by bucket means for long lives), against each bench's
 * window in force now (windows keep no history but the audit trail).
 */
export class ReportsService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly batches: BatchesService,
    private readonly windows: WindowsService,
    private readonly environment: BenchEnvironment,
    private readonly now: () => number = Date.now,
  ) {}

  private async selected(query: ReportQuery): Promise<{ records: BatchRecord[]; views: BatchView[] }> {
    const records = await this.batches.find(query, MAX_REPORT_BATCHES + 1);
    if (records.length > MAX_REPORT_BATCHES) {
      throw new AppError("too-many-batches", `A report covers at most ${MAX_REPORT_BATCHES} batches; narrow the dates, zone or variety`, 400, [{ path: "stuckFrom", message: "Narrow the range" }]);
    }
    return { records, views: await this.batches.views(records) };
  }

  private async computeRow(record: BatchRecord, view: BatchView, nowMs: number): Promise<ComputedRow> {
    const endMs = lifeEndMs(record, view.bench.timeZone, nowMs);
    const stretches = view.placements
      .map((p) => ({ placement: p, fromMs: p.fromMs, toMs: Math.min(p.toMs ?? endMs, endMs) }))
      .filter((s) => s.toMs > s.fromMs);
    const main = [...stretches].sort((a, b) => b.toMs - b.fromMs - (a.toMs - a.fromMs))[0]?.placement ?? view.placements.at(-1)!;
    let sampled = false;
    const totals = new Map<WindowedQuantity, QuantityTotals>();
    for (const quantity of WINDOWED_QUANTITIES) {
      const sum = { inside: 0, below: 0, above: 0, noData: 0, dhBelow: 0, dhAbove: 0 };
      let hasWindow = false;
      for (const s of stretches) {
        const w = this.windows.windowFor(s.placement.benchId, quantity);
        if (w) hasWindow = true;
        const { result, sampled: wasSampled } = await this.environment.timeInWindow(
          s.placement.benchId,
          quantity,
          w ? { min: w.min, max: w.max } : null,
          { fromMs: s.fromMs, toMs: s.toMs },
          REPORT_SAMPLES_PER_SERIES,
        );
        sampled ||= wasSampled;
        sum.inside += result.insideMs;
        sum.below += result.belowMs;
        sum.above += result.aboveMs;
        sum.noData += result.noDataMs;
        sum.dhBelow += result.degreeHoursBelowMin;
        sum.dhAbove += result.degreeHoursAboveMax;
      }
      const mainWindow = this.windows.windowFor(main.benchId, quantity);
      const dataMs = sum.inside + sum.below + sum.above;
      totals.set(quantity, {
        insideMs: sum.inside,
        dataMs,
        hasWindow,
        view: {
          quantity,
          windowMin: mainWindow?.min ?? null,
          windowMax: mainWindow?.max ?? null,
          insidePct: hasWindow ? pooledInsidePct([{ insideMs: sum.inside, dataMs }]) : null,
          insideMinutes: round1(sum.inside / MINUTE_MS),
          belowMinutes: round1(sum.below / MINUTE_MS),
          aboveMinutes: round1(sum.above / MINUTE_MS),
          noDataMinutes: round1(sum.noData / MINUTE_MS),
          degreeHoursBelowMin: sum.dhBelow,
          degreeHoursAboveMax: sum.dhAbove,
        },
      });
    }
    return {
      totals,
      row: {
        batchId: view.id,
        variety: view.variety,
        woodSource: view.woodSource,
        stuckOn: view.stuckOn,
        closedOn: view.closedOn,
        status: view.status,
        outcome: view.outcome,
        stage: view.stage,
        ageDays: view.ageDays,
        tally: view.tally,
        daysToCallus: view.daysToCallus,
        daysToRootInitials: view.daysToRootInitials,
        daysToRooted: view.daysToRooted,
        thicknessMm: view.thicknessMm,
        budsAboveMedium: view.budsAboveMedium,
        baseTreatments: view.baseTreatments,
        hormoneProduct: view.hormoneProduct,
        wrapping: view.wrapping,
        mainBench: { benchId: main.benchId, benchName: main.benchName, zoneId: main.zoneId, zoneName: main.zoneName },
        placements: view.placements,
        timeInWindow: WINDOWED_QUANTITIES.map((q) => totals.get(q)!.view),
        sampled,
      },
    };
  }

  private group(rows: ComputedRow[], keyOf: (r: BatchReportRow) => string, labelOf: (r: BatchReportRow) => string): GroupReportRow[] {
    const groups = new Map<string, ComputedRow[]>();
    for (const r of rows) groups.set(keyOf(r.row), [...(groups.get(keyOf(r.row)) ?? []), r]);
    return [...groups.entries()]
      .map(([key, members]) => {
        const counts = members.map((m) => ({ stuck: m.row.tally.stuck, rooted: m.row.tally.rooted, lost: m.row.tally.lost }));
        const stuck = counts.reduce((n, c) => n + c.stuck, 0);
        const rooted = counts.reduce((n, c) => n + c.rooted, 0);
        const lost = counts.reduce((n, c) => n + c.lost, 0);
        const strike = pooledStrikeRate(counts);
        return {
          key,
          // Named as its earliest batch spells it.
          label: labelOf([...members].sort((x, y) => x.row.batchId - y.row.batchId)[0]!.row),
          batchCount: members.length,
          stuck,
          rooted,
          lost,
          strikeRate: strike.ok ? strike.value : null,
          lossRate: stuck > 0 ? lost / stuck : null,
          daysToCallus: summariseDays(members.map((m) => m.row.daysToCallus)),
          daysToRootInitials: summariseDays(members.map((m) => m.row.daysToRootInitials)),
          daysToRooted: summariseDays(members.map((m) => m.row.daysToRooted)),
          timeInWindow: WINDOWED_QUANTITIES.map((quantity) => {
            const parts = members.map((m) => m.totals.get(quantity)!).filter((t) => t.hasWindow);
            return { quantity, insidePct: parts.length ? pooledInsidePct(parts) : null };
          }),
        };
      })
      .sort((a, b) => a.label.localeCompare(b.label, "en", { numeric: true }) || a.key.localeCompare(b.key));
  }

  private async computed(query: ReportQuery): Promise<ComputedRow[]> {
    await this.windows.ready();
    const { records, views } = await this.selected(query);
    const nowMs = this.now();
    const rows: ComputedRow[] = [];
    for (const [i, record] of records.entries()) rows.push(await this.computeRow(record, views[i]!, nowMs));
    return rows;
  }

  async strikeRates(query: ReportQuery): Promise<StrikeRateReport> {
    const rows = await this.computed(query);
    return {
      generatedAtMs: this.now(),
      batches: rows.map((r) => r.row),
      byVariety: this.group(rows, (r) => r.variety.trim().toLowerCase(), (r) => r.variety.trim()),
      byBench: this.group(rows, (r) => String(r.mainBench.benchId), (r) => `${r.mainBench.zoneName} › ${r.mainBench.benchName}`),
    };
  }

  // ── CSV ───────────────────────────────────────────────────────────────────

  private filename(kind: string): string {
    return `benchwarden-${kind}-${new Date(this.now()).toISOString().slice(0, 10)}.csv`;
  }

  /** One row per batch with the report's figures; units in the header. */
  async batchesCsv(query: ReportQuery): Promise<CsvFile> {
    const rows = await this.computed(query);
    const header = [
      "batch id",
      "variety",
      "wood source",
      "stuck on (date)",
      "closed on (date)",
      "status",
      "outcome",
      "stage",
      "age (days)",
      "count stuck (cuttings)",
      "rooted (cuttings)",
      "lost (cuttings)",
      "pending (cuttings)",
      "strike rate (%)",
      "loss rate (%)",
      "days to callus (days)",
      "days to root initials (days)",
      "days to rooted (days)",
      "thickness (mm)",
      "buds above medium (buds)",
      "base treatment",
      "hormone product and strength",
      "wrapping",
      "zone",
      "bench (longest stay)",
      "benches (history)",
      ...WINDOWED_QUANTITIES.flatMap((q) => [
        `${q} inside window (% of time with data)`,
        `${q} below window (min)`,
        `${q} above window (min)`,
        `${q} no data (min)`,
      ]),
      "sampled (bucket means)",
    ];
    let text = "\uFEFF" + csvLine(header);
    for (const { row } of rows) {
      text += csvLine([
        row.batchId,
        row.variety,
        row.woodSource,
        row.stuckOn,
        row.closedOn,
        row.status,
        row.outcome ? OUTCOME_LABELS[row.outcome] : null,
        STAGE_LABELS[row.stage],
        row.ageDays,
        row.tally.stuck,
        row.tally.rooted,
        row.tally.lost,
        row.tally.pending,
        pct(row.tally.strikeRate),
        pct(row.tally.lossRate),
        row.daysToCallus,
        row.daysToRootInitials,
        row.daysToRooted,
        row.thicknessMm,
        row.budsAboveMedium,
        row.baseTreatments.map((t) => BASE_TREATMENT_LABELS[t]).join("; "),
        row.hormoneProduct,
        row.wrapping ? WRAPPING_LABELS[row.wrapping] : null,
        row.mainBench.zoneName,
        row.mainBench.benchName,
        row.placements.map((p) => `${p.zoneName} › ${p.benchName} from ${new Date(p.fromMs).toISOString()}`).join("; "),
        ...row.timeInWindow.flatMap((t) => [t.insidePct === null ? null : round1(t.insidePct), t.belowMinutes, t.aboveMinutes, t.noDataMinutes]),
        row.sampled ? "yes" : "no",
      ]);
    }
    return { filename: this.filename("batches"), text };
  }

  /** One row per observation of the selected batches (or of one batch), oldest first. */
  async observationsCsv(query: ObservationsCsvQuery): Promise<CsvFile> {
    const records = query.batchId !== undefined ? [await this.batches.record(query.batchId)] : (await this.selected(query)).records;
    const views = await this.batches.views(records);
    const byId = new Map(views.map((v) => [v.id, v]));
    const qb = this.dataSource.getRepository(ObservationEntity).createQueryBuilder("o");
    qb.where(records.length ? "o.batchId IN (:...ids)" : "1 = 0", { ids: records.map((r) => r.id) });
    if (query.observedFrom) qb.andWhere("o.observedOn >= :from", { from: query.observedFrom });
    if (query.observedTo) qb.andWhere("o.observedOn <= :to", { to: query.observedTo });
    const observations = await qb.orderBy("o.observedOn", "ASC").addOrderBy("o.recordedAtMs", "ASC").addOrderBy("o.id", "ASC").take(MAX_OBSERVATION_ROWS + 1).getMany();
    if (observations.length > MAX_OBSERVATION_ROWS) throw new AppError("too-many-observations", `An export carries at most ${MAX_OBSERVATION_ROWS} observations; narrow the dates`, 400);
    const photoCounts = new Map<number, number>();
    if (observations.length) {
      const photos = await this.dataSource.getRepository(ObservationPhotoEntity).findBy({ observationId: In(observations.map((o) => o.id)) });
      for (const p of photos) photoCounts.set(p.observationId, (photoCounts.get(p.observationId) ?? 0) + 1);
    }
    const header = [
      "observation id",
      "batch id",
      "variety",
      "zone",
      "bench",
      "observed on (date)",
      "stage",
      "rooted so far (cuttings)",
      "lost so far (cuttings)",
      "count stuck (cuttings)",
      "strike rate so far (%)",
      ...[...Object.keys(FLAG_LABELS)].map((f) => `${FLAG_LABELS[f as ObservationFlag].toLowerCase()} (flag)`),
      "note",
      "photos (count)",
      "recorded by",
      "recorded at (UTC)",
      "recorded at (site time)",
      "site time zone",
      "round id",
    ];
    let text = "\uFEFF" + csvLine(header);
    for (const o of observations) {
      const batch = byId.get(o.batchId)!;
      // The bench it was on when the observation was recorded.
      const placement = batch.placements.find((p) => p.fromMs <= o.recordedAtMs && (p.toMs === null || o.recordedAtMs < p.toMs)) ?? batch.placements.at(-1)!;
      const flags = new Set(splitList<ObservationFlag>(o.flags));
      text += csvLine([
        o.id,
        o.batchId,
        batch.variety,
        placement.zoneName,
        placement.benchName,
        o.observedOn,
        STAGE_LABELS[o.stage],
        o.rootedCount,
        o.lostCount,
        batch.countStuck,
        o.rootedCount === null ? null : round1((100 * o.rootedCount) / batch.countStuck),
        ...Object.keys(FLAG_LABELS).map((f) => (flags.has(f as ObservationFlag) ? "yes" : "")),
        o.note,
        photoCounts.get(o.id) ?? 0,
        o.recordedByName,
        new Date(o.recordedAtMs).toISOString(),
        localTime(o.recordedAtMs, batch.bench.timeZone),
        batch.bench.timeZone,
        o.roundId,
      ]);
    }
    return { filename: this.filename(query.batchId !== undefined ? `batch-${query.batchId}-observations` : "observations"), text };
  }
}
