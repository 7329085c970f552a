import { In, IsNull, Not, type DataSource, type EntityManager, type FindOptionsWhere } from "typeorm";
import {
  batchTally,
  checkBatchCounts,
  currentStage,
  daysBetween,
  daysToFirstStage,
  latestCounts,
  type BatchStage,
  type CountedObservation,
} from "../../../shared/domain/batch.js";
import { addDays, localDate, localMidnightMs } from "../../../shared/domain/batch-calendar.js";
import type { AuditChange } from "../../../shared/schemas/audit.js";
import {
  treatmentIssues,
  type BaseTreatment,
  type BatchPlacement,
  type BatchesQuery,
  type BatchView,
  type CloseBatchInput,
  type CreateBatchInput,
  type MoveBatchInput,
  type ObservationFlag,
  type ObservationSummary,
  type UpdateBatchInput,
} from "../../../shared/schemas/batches.js";
import { BatchEntity, BatchPlacementEntity, type BatchPlacementRecord, type BatchRecord } from "../../db/entities/batch.entity.js";
import { ObservationEntity, ObservationPhotoEntity, type ObservationRecord } from "../../db/entities/observation.entity.js";
import { BenchEntity } from "../../db/entities/bench.entity.js";
import { ZoneEntity } from "../../db/entities/zone.entity.js";
import type { Principal } from "../../lib/auth.js";
import { AppError, notFound } from "../../lib/errors.js";
import { auditChange, changedFields, writeAuditEntry } from "../audit/audit.service.js";
import { actorName, benchContexts, benchLabel, liveBenchContext, type BenchContext } from "./bench-context.js";

/** A moment a little ahead of the server's clock still counts as now (a tablet's clock may run fast). */
const CLOCK_SKEW_MS = 2 * 60_000;

export const splitList = <T extends string>(text: string): T[] => (text ? (text.split(",") as T[]) : []);
const joinList = (items: readonly string[]): string => items.join(",");

export function toCountedObservation(o: ObservationRecord): CountedObservation {
  return { date: o.observedOn, stage: o.stage, rooted: o.rootedCount, lost: o.lostCount, recordedAtMs: o.recordedAtMs };
}

/** The latest first: by date, then when recorded, then id. */
export function newestFirst(a: ObservationRecord, b: ObservationRecord): number {
  return b.observedOn.localeCompare(a.observedOn) || b.recordedAtMs - a.recordedAtMs || b.id - a.id;
}

/** When a batch's life ends for time-in-window: its close (at the latest the end of the closing date), else now. */
export function lifeEndMs(batch: BatchRecord, timeZone: string, nowMs: number): number {
  if (batch.closedAtMs === null || batch.closedOn === null) return nowMs;
  const endOfDay = localMidnightMs(addDays(batch.closedOn, 1) as string, timeZone) ?? batch.closedAtMs;
  return Math.min(batch.closedAtMs, endOfDay);
}

const AUDIT_FIELDS = {
  variety: "text",
  woodSource: "text",
  stuckOn: "text",
  countStuck: "number",
  thicknessMm: "number",
  budsAboveMedium: "number",
  baseTreatments: "text",
  hormoneProduct: "text",
  wrapping: "text",
  notes: "text",
} as const;

/**
 * Batches of cuttings: create, edit, move between benches (every placement kept with its times),
 * close with an outcome and reopen; each change audited in its own transaction. Stage and counts
 * come from the observations (shared/domain/batch.ts); a closed batch's counts are its final ones.
 */
export class BatchesService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly now: () => number = Date.now,
  ) {}

  // ── reading ───────────────────────────────────────────────────────────────

  async record(id: number, manager: EntityManager = this.dataSource.manager): Promise<BatchRecord> {
    const batch = await manager.getRepository(BatchEntity).findOneBy({ id });
    if (!batch) throw notFound("batch-not-found", `There is no batch ${id}`);
    return batch;
  }

  async get(id: number): Promise<BatchView> {
    return (await this.views([await this.record(id)]))[0]!;
  }

  async list(query: BatchesQuery): Promise<BatchView[]> {
    return this.views(await this.find(query, query.limit));
  }

  /** The batch records a query selects, newest stuck first (at most `limit`). */
  async find(
    query: Pick<BatchesQuery, "status" | "siteId" | "zoneId" | "benchId" | "variety" | "stuckFrom" | "stuckTo">,
    limit: number,
  ): Promise<BatchRecord[]> {
    const qb = this.dataSource.getRepository(BatchEntity).createQueryBuilder("b");
    if (query.status === "open") qb.andWhere("b.closedAtMs IS NULL");
    if (query.status === "closed") qb.andWhere("b.closedAtMs IS NOT NULL");
    if (query.benchId !== undefined) qb.andWhere("b.benchId = :benchId", { benchId: query.benchId });
    if (query.zoneId !== undefined || query.siteId !== undefined) {
      const zoneWhere: FindOptionsWhere<{ id: number; siteId: number }> = {};
      if (query.zoneId !== undefined) zoneWhere.id = query.zoneId;
      if (query.siteId !== undefined) zoneWhere.siteId = query.siteId;
      const zones = await this.dataSource.getRepository(ZoneEntity).findBy(zoneWhere);
      const benches = zones.length ? await this.dataSource.getRepository(BenchEntity).findBy({ zoneId: In(zones.map((z) => z.id)) }) : [];
      if (benches.length === 0) return [];
      qb.andWhere("b.benchId IN (:...benchIds)", { benchIds: benches.map((b) => b.id) });
    }
    if (query.variety !== undefined) qb.andWhere("LOWER(b.variety) = LOWER(:variety)", { variety: query.variety });
    if (query.stuckFrom !== undefined) qb.andWhere("b.stuckOn >= :stuckFrom", { stuckFrom: query.stuckFrom });
    if (query.stuckTo !== undefined) qb.andWhere("b.stuckOn <= :stuckTo", { stuckTo: query.stuckTo });
    return qb.orderBy("b.stuckOn", "DESC").addOrderBy("b.id", "DESC").take(limit).getMany();
  }

  /** Placements of the batches, oldest first per batch. */
  async placementsOf(batchIds: number[], manager: EntityManager = this.dataSource.manager): Promise<Map<number, BatchPlacementRecord[]>> {
    const out = new Map<number, BatchPlacementRecord[]>();
    if (batchIds.length === 0) return out;
    const rows = await manager.getRepository(BatchPlacementEntity).find({ where: { batchId: In(batchIds) }, order: { fromMs: "ASC", id: "ASC" } });
    for (const r of rows) out.set(r.batchId, [...(out.get(r.batchId) ?? []), r]);
    return out;
  }

  /** The API views of batch records, loading placements, observations and photo counts in a few queries. */
  async views(batches: BatchRecord[]): Promise<BatchView[]> {
    if (batches.length === 0) return [];
    const ids = batches.map((b) => b.id);
    const placements = await this.placementsOf(ids);
    const contexts = await benchContexts(this.dataSource.manager, [...batches.map((b) => b.benchId), ...[...placements.values()].flat().map((p) => p.benchId)]);
    const observations = await this.dataSource.getRepository(ObservationEntity).find({ where: { batchId: In(ids) } });
    const photoCounts = await this.photoCounts(observations.map((o) => o.id));
    const byBatch = new Map<number, ObservationRecord[]>();
    for (const o of observations) byBatch.set(o.batchId, [...(byBatch.get(o.batchId) ?? []), o]);
    const nowMs = this.now();
    return batches.map((b) => this.view(b, placements.get(b.id) ?? [], byBatch.get(b.id) ?? [], photoCounts, contexts, nowMs));
  }

  /** Photos per observation id. */
  async photoCounts(observationIds: number[]): Promise<Map<number, number>> {
    const out = new Map<number, number>();
    if (observationIds.length === 0) return out;
    const rows = await this.dataSource
      .getRepository(ObservationPhotoEntity)
      .createQueryBuilder("p")
      .select("p.observationId", "observationId")
      .addSelect("COUNT(*)", "n")
      .where("p.observationId IN (:...ids)", { ids: observationIds })
      .groupBy("p.observationId")
      .getRawMany<{ observationId: number; n: number }>();
    for (const r of rows) out.set(Number(r.observationId), Number(r.n));
    return out;
  }

  private view(
    b: BatchRecord,
    placements: BatchPlacementRecord[],
    observations: ObservationRecord[],
    photoCounts: Map<number, number>,
    contexts: Map<number, BenchContext>,
    nowMs: number,
  ): BatchView {
    const context = contexts.get(b.benchId);
    const timeZone = context?.site.timeZone ?? "UTC";
    const counted = observations.map(toCountedObservation);
    const closed = b.closedAtMs !== null;
    const counts = closed ? { rooted: b.finalRooted ?? 0, lost: b.finalLost ?? 0 } : latestCounts(counted);
    const tally = batchTally({ stuck: b.countStuck, ...counts });
    let stage = currentStage(counted) as BatchStage;
    if (b.outcome === "potted-on") stage = "potted-on";
    else if (b.outcome === "lost") stage = "lost";
    const days = (target: "callused" | "root-initials" | "rooted") => {
      const r = daysToFirstStage(b.stuckOn, counted, target);
      return r.ok ? r.value : null;
    };
    const age = daysBetween(b.stuckOn, b.closedOn ?? localDate(nowMs, timeZone));
    const latest = [...observations].sort(newestFirst)[0];
    const photoCount = observations.reduce((n, o) => n + (photoCounts.get(o.id) ?? 0), 0);
    return {
      id: b.id,
      variety: b.variety,
      woodSource: b.woodSource,
      stuckOn: b.stuckOn,
      countStuck: b.countStuck,
      thicknessMm: b.thicknessMm,
      budsAboveMedium: b.budsAboveMedium,
      baseTreatments: splitList<BaseTreatment>(b.baseTreatments),
      hormoneProduct: b.hormoneProduct,
      wrapping: b.wrapping,
      notes: b.notes,
      bench: {
        benchId: b.benchId,
        benchName: context?.bench.name ?? `Bench ${b.benchId}`,
        zoneId: context?.zone.id ?? 0,
        zoneName: context?.zone.name ?? "",
        siteId: context?.site.id ?? 0,
        timeZone,
      },
      placements: placements.map((p) => placementView(p, contexts)),
      status: closed ? "closed" : "open",
      stage,
      tally: tally.ok
        ? { ...tally.value, isFinal: closed }
        : { stuck: b.countStuck, ...counts, pending: Math.max(0, b.countStuck - counts.rooted - counts.lost), strikeRate: null, lossRate: null, isFinal: closed },
      ageDays: age.ok ? Math.max(0, age.value) : 0,
      daysToCallus: days("callused"),
      daysToRootInitials: days("root-initials"),
      daysToRooted: days("rooted"),
      lastObservation: latest ? observationSummary(latest, photoCounts.get(latest.id) ?? 0) : null,
      observationCount: observations.length,
      photoCount,
      outcome: b.outcome,
      closedOn: b.closedOn,
      closedAtMs: b.closedAtMs,
      closeNote: b.closeNote,
      createdAtMs: b.createdAtMs,
      createdByName: b.createdByName,
      updatedAtMs: b.updatedAtMs,
    };
  }

  // ── changing ──────────────────────────────────────────────────────────────

  private todayIn(timeZone: string): string {
    return localDate(this.now() + CLOCK_SKEW_MS, timeZone);
  }

  private assertNotFuture(date: string, timeZone: string, path: string, what: string): void {
    if (date > this.todayIn(timeZone)) throw new AppError("date-in-future", `${what} cannot be in the future`, 400, [{ path, message: "Choose today or an earlier date" }]);
  }

  async create(input: CreateBatchInput, actor: Principal): Promise<BatchView> {
    const context = await liveBenchContext(this.dataSource.manager, input.benchId);
    const timeZone = context.site.timeZone;
    this.assertNotFuture(input.stuckOn, timeZone, "stuckOn", "The date stuck");
    const atMs = this.now();
    const id = await this.dataSource.transaction(async (tx) => {
      const name = await actorName(tx, actor);
      const saved = await tx.getRepository(BatchEntity).save({
        variety: input.variety,
        woodSource: input.woodSource,
        stuckOn: input.stuckOn,
        countStuck: input.countStuck,
        thicknessMm: input.thicknessMm,
        budsAboveMedium: input.budsAboveMedium,
        baseTreatments: joinList(input.baseTreatments),
        hormoneProduct: input.hormoneProduct,
        wrapping: input.wrapping,
        notes: input.notes,
        benchId: input.benchId,
        outcome: null,
        closedOn: null,
        closedAtMs: null,
        finalRooted: null,
        finalLost: null,
        closeNote: null,
        createdAtMs: atMs,
        createdByUserId: actor.userId,
        createdByName: name,
        updatedAtMs: atMs,
      });
      // The batch's life (and its first placement) starts at local midnight of the day stuck.
      const fromMs = Math.min(localMidnightMs(input.stuckOn, timeZone) ?? atMs, atMs);
      await tx.getRepository(BatchPlacementEntity).insert({ batchId: saved.id, benchId: input.benchId, fromMs, toMs: null, note: null, movedByUserId: actor.userId, movedByName: name });
      await writeAuditEntry(
        tx,
        {
          ...this.auditPlace(context),
          entityType: "batch",
          entityId: saved.id,
          action: "created",
          subject: this.subject(saved, context),
          changes: [auditChange("benchId", "reference", null, input.benchId, { newLabel: benchLabel(context) }), ...changedFields(null, saved, AUDIT_FIELDS)],
        },
        atMs,
        actor,
      );
      return saved.id;
    });
    return this.get(id);
  }

  async update(id: number, input: UpdateBatchInput, actor: Principal): Promise<BatchView> {
    const before = await this.record(id);
    const context = (await benchContexts(this.dataSource.manager, [before.benchId])).get(before.benchId)!;
    const timeZone = context.site.timeZone;
    const merged = {
      variety: input.variety ?? before.variety,
      woodSource: input.woodSource !== undefined ? input.woodSource : before.woodSource,
      stuckOn: input.stuckOn ?? before.stuckOn,
      countStuck: input.countStuck ?? before.countStuck,
      thicknessMm: input.thicknessMm !== undefined ? input.thicknessMm : before.thicknessMm,
      budsAboveMedium: input.budsAboveMedium !== undefined ? input.budsAboveMedium : before.budsAboveMedium,
      baseTreatments: input.baseTreatments ?? splitList<BaseTreatment>(before.baseTreatments),
      hormoneProduct: input.hormoneProduct !== undefined ? input.hormoneProduct : before.hormoneProduct,
      wrapping: input.wrapping !== undefined ? input.wrapping : before.wrapping,
      notes: input.notes !== undefined ? input.notes : before.notes,
    };
    const issues = treatmentIssues(merged);
    if (issues.length > 0) throw new AppError("invalid-input", "Some fields are not valid", 400, issues);

    const observations = await this.dataSource.getRepository(ObservationEntity).findBy({ batchId: id });
    // Fewer stuck than already counted would break every rate.
    const counted = [...observations.map((o) => ({ rooted: o.rootedCount ?? 0, lost: o.lostCount ?? 0 })), latestCounts(observations.map(toCountedObservation))];
    if (before.finalRooted !== null) counted.push({ rooted: before.finalRooted, lost: before.finalLost ?? 0 });
    for (const c of counted) {
      const check = checkBatchCounts({ stuck: merged.countStuck, ...c });
      if (!check.ok) throw new AppError("counts-exceed-stuck", `Observations already count ${c.rooted} rooted and ${c.lost} lost; the count stuck cannot be lower`, 400, [{ path: "countStuck", message: check.detail }]);
    }

    let firstPlacement: BatchPlacementRecord | undefined;
    let newFromMs: number | undefined;
    if (merged.stuckOn !== before.stuckOn) {
      this.assertNotFuture(merged.stuckOn, timeZone, "stuckOn", "The date stuck");
      const earliest = observations.map((o) => o.observedOn).sort()[0];
      if (earliest !== undefined && earliest < merged.stuckOn) {
        throw new AppError("date-after-observations", `There is an observation on ${earliest}, before ${merged.stuckOn}`, 400, [{ path: "stuckOn", message: "Choose a date on or before the first observation" }]);
      }
      if (before.closedOn !== null && before.closedOn < merged.stuckOn) {
        throw new AppError("date-after-close", `The batch closed on ${before.closedOn}`, 400, [{ path: "stuckOn", message: "Choose a date on or before the closing date" }]);
      }
      const placements = (await this.placementsOf([id])).get(id) ?? [];
      firstPlacement = placements[0];
      newFromMs = localMidnightMs(merged.stuckOn, timeZone) ?? before.createdAtMs;
      const nextStart = placements[1]?.fromMs ?? firstPlacement?.toMs ?? null;
      if (nextStart !== null && newFromMs >= nextStart) {
        throw new AppError("date-after-move", "The batch moved bench before that date", 400, [{ path: "stuckOn", message: "Choose a date before its first move" }]);
      }
    }

    const after = { ...before, ...merged, baseTreatments: joinList(merged.baseTreatments) };
    const changes = changedFields(before, after, AUDIT_FIELDS);
    if (changes.length > 0) {
      const atMs = this.now();
      await this.dataSource.transaction(async (tx) => {
        const { bench: _bench, id: _id, ...columns } = after;
        await tx.getRepository(BatchEntity).update({ id }, { ...columns, updatedAtMs: atMs });
        if (firstPlacement && newFromMs !== undefined) await tx.getRepository(BatchPlacementEntity).update({ id: firstPlacement.id }, { fromMs: newFromMs });
        await writeAuditEntry(tx, { ...this.auditPlace(context), entityType: "batch", entityId: id, action: "updated", subject: this.subject(after, context), changes }, atMs, actor);
      });
    }
    return this.get(id);
  }

  async move(id: number, input: MoveBatchInput, actor: Principal): Promise<BatchView> {
    const batch = await this.record(id);
    if (batch.closedAtMs !== null) throw new AppError("batch-closed", "This batch is closed; reopen it to move it", 409);
    const from = (await benchContexts(this.dataSource.manager, [batch.benchId])).get(batch.benchId)!;
    const to = await liveBenchContext(this.dataSource.manager, input.benchId);
    if (to.bench.id === batch.benchId) throw new AppError("already-on-bench", `The batch is already on ${benchLabel(to)}`, 409, [{ path: "benchId", message: "Choose another bench" }]);
    const nowMs = this.now();
    const atMs = input.effectiveAtMs ?? nowMs;
    if (atMs > nowMs + CLOCK_SKEW_MS) throw new AppError("time-in-future", "A move cannot take effect in the future", 400, [{ path: "effectiveAtMs", message: "Choose now or an earlier time" }]);
    const placements = (await this.placementsOf([id])).get(id) ?? [];
    const open = placements.find((p) => p.toMs === null);
    if (!open) throw new AppError("placement-missing", "The batch has no current bench", 500);
    if (atMs <= open.fromMs) {
      throw new AppError("time-before-placement", `The batch has been on ${from.bench.name} only since ${new Date(open.fromMs).toISOString()}`, 400, [{ path: "effectiveAtMs", message: "Choose a time after it came to its current bench" }]);
    }
    await this.dataSource.transaction(async (tx) => {
      const name = await actorName(tx, actor);
      await tx.getRepository(BatchPlacementEntity).update({ id: open.id }, { toMs: atMs });
      await tx.getRepository(BatchPlacementEntity).insert({ batchId: id, benchId: to.bench.id, fromMs: atMs, toMs: null, note: input.note ?? null, movedByUserId: actor.userId, movedByName: name });
      await tx.getRepository(BatchEntity).update({ id }, { benchId: to.bench.id, updatedAtMs: nowMs });
      const changes: AuditChange[] = [auditChange("benchId", "reference", from.bench.id, to.bench.id, { oldLabel: benchLabel(from), newLabel: benchLabel(to) })];
      await writeAuditEntry(
        tx,
        {
          ...this.auditPlace(to),
          previousZoneId: from.zone.id !== to.zone.id ? from.zone.id : null,
          entityType: "batch",
          entityId: id,
          action: "moved",
          subject: this.subject(batch, to),
          changes: [...changes, auditChange("effectiveAtMs", "time", null, atMs)],
          note: input.note ?? null,
        },
        nowMs,
        actor,
      );
    });
    return this.get(id);
  }

  async close(id: number, input: CloseBatchInput, actor: Principal): Promise<BatchView> {
    const batch = await this.record(id);
    if (batch.closedAtMs !== null) throw new AppError("batch-closed", `This batch was already closed on ${batch.closedOn}`, 409);
    const context = (await benchContexts(this.dataSource.manager, [batch.benchId])).get(batch.benchId)!;
    const timeZone = context.site.timeZone;
    const closedOn = input.closedOn ?? this.todayIn(timeZone);
    this.assertNotFuture(closedOn, timeZone, "closedOn", "The closing date");
    if (closedOn < batch.stuckOn) throw new AppError("date-before-sticking", `The batch was stuck on ${batch.stuckOn}`, 400, [{ path: "closedOn", message: "Choose a date on or after the date stuck" }]);
    const observations = await this.dataSource.getRepository(ObservationEntity).findBy({ batchId: id });
    const latest = latestCounts(observations.map(toCountedObservation));
    const rooted = input.rootedCount ?? latest.rooted;
    const lost = input.lostCount ?? latest.lost;
    const check = checkBatchCounts({ stuck: batch.countStuck, rooted, lost });
    if (!check.ok) throw new AppError("counts-exceed-stuck", check.detail, 400, [{ path: "rootedCount", message: check.detail }, { path: "lostCount", message: check.detail }]);
    const nowMs = this.now();
    const closedAtMs = nowMs;
    const endMs = lifeEndMs({ ...batch, closedOn, closedAtMs }, timeZone, nowMs);
    await this.dataSource.transaction(async (tx) => {
      const open = await tx.getRepository(BatchPlacementEntity).findOneBy({ batchId: id, toMs: IsNull() });
      if (open) await tx.getRepository(BatchPlacementEntity).update({ id: open.id }, { toMs: Math.max(open.fromMs + 1, endMs) });
      await tx.getRepository(BatchEntity).update({ id }, { outcome: input.outcome, closedOn, closedAtMs, finalRooted: rooted, finalLost: lost, closeNote: input.note ?? null, updatedAtMs: nowMs });
      await writeAuditEntry(
        tx,
        {
          ...this.auditPlace(context),
          entityType: "batch",
          entityId: id,
          action: "closed",
          subject: this.subject(batch, context),
          changes: [
            auditChange("outcome", "text", null, input.outcome),
            auditChange("closedOn", "text", null, closedOn),
            auditChange("finalRooted", "number", null, rooted),
            auditChange("finalLost", "number", null, lost),
          ],
          note: input.note ?? null,
        },
        nowMs,
        actor,
      );
    });
    return this.get(id);
  }

  async reopen(id: number, actor: Principal): Promise<BatchView> {
    const batch = await this.record(id);
    if (batch.closedAtMs === null) throw new AppError("batch-open", "This batch is not closed", 409);
    const context = await liveBenchContext(this.dataSource.manager, batch.benchId);
    const nowMs = this.now();
    await this.dataSource.transaction(async (tx) => {
      const last = await tx.getRepository(BatchPlacementEntity).findOne({ where: { batchId: id, toMs: Not(IsNull()) }, order: { fromMs: "DESC", id: "DESC" } });
      if (last) await tx.getRepository(BatchPlacementEntity).update({ id: last.id }, { toMs: null });
      await tx.getRepository(BatchEntity).update({ id }, { outcome: null, closedOn: null, closedAtMs: null, finalRooted: null, finalLost: null, closeNote: null, updatedAtMs: nowMs });
      await writeAuditEntry(
        tx,
        {
          ...this.auditPlace(context),
          entityType: "batch",
          entityId: id,
          action: "reopened",
          subject: this.subject(batch, context),
          changes: [auditChange("outcome", "text", batch.outcome, null), auditChange("closedOn", "text", batch.closedOn, null)],
        },
        nowMs,
        actor,
      );
    });
    return this.get(id);
  }

  private auditPlace(context: BenchContext): { siteId: number; zoneId: number; benchId: number } {
    return { siteId: context.site.id, zoneId: context.zone.id, benchId: context.bench.id };
  }

  /** "Batch 12 · Harbour Amber, stuck 2025-01-20 (House 1 · Fig cuttings › Bench 2)" */
  private subject(batch: { id: number; variety: string; stuckOn: string }, context: BenchContext): string {
    return `Batch ${batch.id} · ${batch.variety}, stuck ${batch.stuckOn} (${benchLabel(context)})`;
  }
}

export function placementView(p: BatchPlacementRecord, contexts: Map<number, BenchContext>): BatchPlacement {
  const c = contexts.get(p.benchId);
  return {
    benchId: p.benchId,
    benchName: c?.bench.name ?? `Bench ${p.benchId}`,
    zoneId: c?.zone.id ?? 0,
    zoneName: c?.zone.name ?? "",
    fromMs: p.fromMs,
    toMs: p.toMs,
    note: p.note,
    movedByName: p.movedByName,
  };
}

export function observationSummary(o: ObservationRecord, photoCount: number): ObservationSummary {
  return { id: o.id, observedOn: o.observedOn, stage: o.stage, flags: splitList<ObservationFlag>(o.flags), note: o.note, photoCount };
}
