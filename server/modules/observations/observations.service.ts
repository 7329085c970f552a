import { Between, In, type DataSource } from "typeorm";
import { checkBatchCounts, latestCounts, placementAt } from "../../../shared/domain/batch.js";
import { localDate, observationTime } from "../../../shared/domain/batch-calendar.js";
import type {
  BenchObservation,
  BenchObservationsQuery,
  BenchObservationsResponse,
  CreateObservationInput,
  CreateObservationResponse,
  ObservationFlag,
  ObservationView,
  PhotoView,
  UpdateObservationInput,
} from "../../../shared/schemas/batches.js";
import { BatchEntity, BatchPlacementEntity, type BatchRecord } from "../../db/entities/batch.entity.js";
import { BenchEntity } from "../../db/entities/bench.entity.js";
import { ObservationEntity, type ObservationRecord } from "../../db/entities/observation.entity.js";
import { WalkRoundEntity } from "../../db/entities/walk-round.entity.js";
import { ZoneEntity } from "../../db/entities/zone.entity.js";
import type { Principal } from "../../lib/auth.js";
import { AppError, notFound } from "../../lib/errors.js";
import { actorName, benchContexts, isUniqueViolation } from "../batches/bench-context.js";
import { splitList, toCountedObservation, type BatchesService } from "../batches/batches.service.js";
import type { PhotosService } from "../photos/photos.service.js";

const DAY_MS = 86_400_000;

/** A date a little ahead of the server's still counts as today (a tablet's clock may run fast). */
const CLOCK_SKEW_MS = 2 * 60_000;

/** Oldest first: by date, then when recorded, then id. */
function oldestFirst(a: ObservationRecord, b: ObservationRecord): number {
  return a.observedOn.localeCompare(b.observedOn) || a.recordedAtMs - b.recordedAtMs || a.id - b.id;
}

function view(o: ObservationRecord, photos: PhotoView[]): ObservationView {
  return {
    id: o.id,
    clientId: o.clientId,
    batchId: o.batchId,
    roundId: o.roundId,
    observedOn: o.observedOn,
    stage: o.stage,
    rootedCount: o.rootedCount,
    lostCount: o.lostCount,
    flags: splitList<ObservationFlag>(o.flags),
    note: o.note,
    recordedAtMs: o.recordedAtMs,
    recordedBy: { userId: o.recordedByUserId, name: o.recordedByName },
    updatedAtMs: o.updatedAtMs,
    photos,
  };
}

/**
 * Observations of batches. Creating one is idempotent on the device's clientId, so a tablet that
 * re-sends after a dropped connection stores it once. Counts are running totals checked against
 * the count stuck.
 */
export class ObservationsService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly batches: BatchesService,
    private readonly photos: PhotosService,
    private readonly now: () => number = Date.now,
  ) {}

  async record(id: number): Promise<ObservationRecord> {
    const o = await this.dataSource.getRepository(ObservationEntity).findOneBy({ id });
    if (!o) throw notFound("observation-not-found", `There is no observation ${id}`);
    return o;
  }

  async views(records: ObservationRecord[]): Promise<ObservationView[]> {
    const photos = await this.photos.viewsOf(records.map((o) => o.id));
    return records.map((o) => view(o, photos.get(o.id) ?? []));
  }

  async get(id: number): Promise<ObservationView> {
    return (await this.views([await this.record(id)]))[0]!;
  }

  async listForBatch(batchId: number): Promise<ObservationView[]> {
    await this.batches.record(batchId);
    const rows = await this.dataSource.getRepository(ObservationEntity).findBy({ batchId });
    return this.views(rows.sort(oldestFirst));
  }

  /** Observations of a round, per batch (for the cards of a resumed round). */
  async forRound(roundId: number, batchIds: number[]): Promise<Map<number, ObservationView[]>> {
    const out = new Map<number, ObservationView[]>();
    if (batchIds.length === 0) return out;
    const rows = await this.dataSource.getRepository(ObservationEntity).findBy({ roundId, batchId: In(batchIds) });
    for (const v of await this.views(rows.sort(oldestFirst))) out.set(v.batchId, [...(out.get(v.batchId) ?? []), v]);
    return out;
  }

  /**
   * Observations made on a bench, or on any bench of a zone, in [fromMs, toMs) (the history
   * charts' markers). Each is placed at its time (observationTime, in its site's time zone) on the
   * bench its batch stood on then (placementAt); oldest first, at most `limit` (the newest).
   */
  async onBenches(query: BenchObservationsQuery): Promise<BenchObservationsResponse> {
    const manager = this.dataSource.manager;
    let benchIds: number[];
    if (query.benchId !== undefined) {
      if (!(await manager.getRepository(BenchEntity).existsBy({ id: query.benchId }))) throw notFound("bench-not-found", `There is no bench ${query.benchId}`);
      benchIds = [query.benchId];
    } else {
      const zoneId = query.zoneId!;
      if (!(await manager.getRepository(ZoneEntity).existsBy({ id: zoneId }))) throw notFound("zone-not-found", `There is no zone ${zoneId}`);
      // Archived benches too: their history stays.
      benchIds = (await manager.getRepository(BenchEntity).find({ where: { zoneId }, select: { id: true } })).map((b) => b.id);
    }
    const { fromMs, toMs } = query;
    if (benchIds.length === 0) return { observations: [], isTruncated: false };

    // Batches that stood on one of the benches about then (a day's slack either side: a date-only
    // observation sits at noon of its date), and their observations dated about then (two days'
    // slack: dates are site-local, the bounds UTC); exact times are worked out below.
    const near = (await manager
      .getRepository(BatchPlacementEntity)
      .createQueryBuilder("p")
      .select("DISTINCT p.batchId", "batchId")
      .where("p.benchId IN (:...benchIds)", { benchIds })
      .andWhere("p.fromMs < :to", { to: toMs + DAY_MS })
      .andWhere("(p.toMs IS NULL OR p.toMs > :from)", { from: fromMs - DAY_MS })
      .getRawMany()) as { batchId: number }[];
    if (near.length === 0) return { observations: [], isTruncated: false };
    const batchIds = near.map((n) => Number(n.batchId));
    const utcDate = (ms: number) => new Date(ms).toISOString().slice(0, 10);
    const records = await manager.getRepository(ObservationEntity).findBy({ batchId: In(batchIds), observedOn: Between(utcDate(fromMs - 2 * DAY_MS), utcDate(toMs + 2 * DAY_MS)) });
    if (records.length === 0) return { observations: [], isTruncated: false };

    const batches = new Map((await manager.getRepository(BatchEntity).findBy({ id: In([...new Set(records.map((o) => o.batchId))]) })).map((b) => [b.id, b]));
    const placements = await this.batches.placementsOf([...batches.keys()]);
    const contexts = await benchContexts(manager, [...batches.values()].map((b) => b.benchId).concat([...placements.values()].flat().map((p) => p.benchId)));
    const wanted = new Set(benchIds);
    const found: BenchObservation[] = [];
    for (const o of records) {
      const batch = batches.get(o.batchId);
      if (!batch) continue;
      const { timeMs, isDateOnly } = observationTime(o.observedOn, o.recordedAtMs, contexts.get(batch.benchId)?.site.timeZone ?? "UTC");
      if (timeMs < fromMs || timeMs >= toMs) continue;
      const benchId = placementAt(placements.get(batch.id) ?? [], timeMs)?.benchId ?? batch.benchId;
      if (!wanted.has(benchId)) continue;
      found.push({
        id: o.id,
        batchId: batch.id,
        variety: batch.variety,
        countStuck: batch.countStuck,
        benchId,
        benchName: contexts.get(benchId)?.bench.name ?? `Bench ${benchId}`,
        timeMs,
        isDateOnly,
        observedOn: o.observedOn,
        stage: o.stage,
        rootedCount: o.rootedCount,
        lostCount: o.lostCount,
        flags: splitList<ObservationFlag>(o.flags),
        note: o.note,
        recordedByName: o.recordedByName,
      });
    }
    found.sort((a, b) => a.timeMs - b.timeMs || a.id - b.id);
    return { observations: found.slice(-query.limit), isTruncated: found.length > query.limit };
  }

  private async timeZoneOf(batch: BatchRecord): Promise<string> {
    return (await benchContexts(this.dataSource.manager, [batch.benchId])).get(batch.benchId)?.site.timeZone ?? "UTC";
  }

  /** Date and counts rules shared by create and update; returns the date to store. */
  private async checkAgainstBatch(
    batch: BatchRecord,
    fields: { observedOn: string; rootedCount: number | null; lostCount: number | null },
    others: ObservationRecord[],
  ): Promise<void> {
    const timeZone = await this.timeZoneOf(batch);
    if (fields.observedOn < batch.stuckOn) {
      throw new AppError("date-before-sticking", `The batch was stuck on ${batch.stuckOn}`, 400, [{ path: "observedOn", message: "Choose a date on or after the date stuck" }]);
    }
    if (fields.observedOn > localDate(this.now() + CLOCK_SKEW_MS, timeZone)) {
      throw new AppError("date-in-future", "An observation cannot be dated in the future", 400, [{ path: "observedOn", message: "Choose today or an earlier date" }]);
    }
    // Running totals: a count left out stands at the latest one recorded.
    const latest = latestCounts(others.map(toCountedObservation));
    const rooted = fields.rootedCount ?? latest.rooted;
    const lost = fields.lostCount ?? latest.lost;
    const check = checkBatchCounts({ stuck: batch.countStuck, rooted, lost });
    if (!check.ok) {
      const message = `${rooted} rooted + ${lost} lost is more than the ${batch.countStuck} stuck`;
      throw new AppError("counts-exceed-stuck", message, 400, [
        { path: "rootedCount", message },
        { path: "lostCount", message },
      ]);
    }
  }

  async create(batchId: number, input: CreateObservationInput, actor: Principal): Promise<CreateObservationResponse> {
    const repo = this.dataSource.getRepository(ObservationEntity);
    const already = async (): Promise<CreateObservationResponse | null> => {
      const found = await repo.findOneBy({ clientId: input.clientId });
      if (!found) return null;
      if (found.batchId !== batchId) {
        throw new AppError("client-id-in-use", "This clientId belongs to an observation of another batch; make a new one for each observation", 409, [{ path: "clientId", message: "Already used" }]);
      }
      return { observation: await this.get(found.id), created: false };
    };
    const replay = await already();
    if (replay) return replay;

    const batch = await this.batches.record(batchId);
    if (batch.closedAtMs !== null) throw new AppError("batch-closed", `This batch was closed on ${batch.closedOn}; reopen it to record more`, 409);
    if (input.roundId !== null && !(await this.dataSource.getRepository(WalkRoundEntity).existsBy({ id: input.roundId }))) {
      throw new AppError("round-not-found", `There is no round ${input.roundId}`, 400, [{ path: "roundId", message: "Unknown round" }]);
    }
    const timeZone = await this.timeZoneOf(batch);
    const observedOn = input.observedOn ?? localDate(this.now(), timeZone);
    const others = await repo.findBy({ batchId });
    await this.checkAgainstBatch(batch, { observedOn, rootedCount: input.rootedCount, lostCount: input.lostCount }, others);

    const atMs = this.now();
    try {
      const saved = await repo.save({
        clientId: input.clientId,
        batchId,
        roundId: input.roundId,
        observedOn,
        stage: input.stage,
        rootedCount: input.rootedCount,
        lostCount: input.lostCount,
        flags: input.flags.join(","),
        note: input.note,
        recordedAtMs: atMs,
        recordedByUserId: actor.userId,
        recordedByName: await actorName(this.dataSource.manager, actor),
        updatedAtMs: atMs,
      });
      return { observation: await this.get(saved.id), created: true };
    } catch (err) {
      // Two copies of one re-send arrived together: the other one stored it.
      if (isUniqueViolation(err)) {
        const raced = await already();
        if (raced) return raced;
      }
      throw err;
    }
  }

  async update(id: number, input: UpdateObservationInput): Promise<ObservationView> {
    const before = await this.record(id);
    const batch = await this.batches.record(before.batchId);
    const after = {
      observedOn: input.observedOn ?? before.observedOn,
      stage: input.stage ?? before.stage,
      rootedCount: input.rootedCount !== undefined ? input.rootedCount : before.rootedCount,
      lostCount: input.lostCount !== undefined ? input.lostCount : before.lostCount,
      flags: input.flags !== undefined ? input.flags.join(",") : before.flags,
      note: input.note !== undefined ? input.note : before.note,
    };
    const others = (await this.dataSource.getRepository(ObservationEntity).findBy({ batchId: before.batchId })).filter((o) => o.id !== id);
    await this.checkAgainstBatch(batch, after, others);
    await this.dataSource.getRepository(ObservationEntity).update({ id }, { ...after, updatedAtMs: this.now() });
    return this.get(id);
  }

  /** Deletes the observation with its photos (rows and files). */
  async delete(id: number): Promise<void> {
    await this.record(id);
    const photos = await this.photos.photosOf(id);
    await this.dataSource.getRepository(ObservationEntity).delete({ id });
    await this.photos.removeFiles(photos);
  }
}
