import { In, IsNull, Not, type DataSource, type EntityManager } from "typeorm";
import { roundLookbackStartMs } from "../../../shared/domain/batch-calendar.js";
import type { TemperatureUnit } from "../../../shared/domain/units.js";
import type { ObservationFlag } from "../../../shared/schemas/batches.js";
import { WINDOWED_QUANTITIES } from "../../../shared/schemas/quantities.js";
import {
  MAX_CARD_LOOKBACK_MS,
  ROUND_STALE_AFTER_MS,
  type BenchCard,
  type BenchCheck,
  type CardBatch,
  type CheckBenchInput,
  type QuantityCard,
  type RoundBench,
  type RoundsQuery,
  type RoundSummary,
  type RoundView,
  type StartRoundInput,
  type StartRoundResponse,
  type SummaryQuantity,
} from "../../../shared/schemas/rounds.js";
import { AlertEntity } from "../../db/entities/alert.entity.js";
import { BatchEntity } from "../../db/entities/batch.entity.js";
import { BenchEntity, type Bench } from "../../db/entities/bench.entity.js";
import { ObservationEntity, ObservationPhotoEntity } from "../../db/entities/observation.entity.js";
import { SiteEntity, type Site } from "../../db/entities/site.entity.js";
import { UserEntity, type UserRecord } from "../../db/entities/user.entity.js";
import { WalkRoundBenchEntity, WalkRoundEntity, type WalkRoundBenchRecord, type WalkRoundRecord } from "../../db/entities/walk-round.entity.js";
import { ZoneEntity, type Zone } from "../../db/entities/zone.entity.js";
import type { Principal } from "../../lib/auth.js";
import type { Logger } from "../../lib/logger.js";
import { AppError, notFound } from "../../lib/errors.js";
import type { Mailer } from "../../mail/outbox.js";
import type { AlertsService } from "../alerts/alerts.service.js";
import { actorName, isUniqueViolation } from "../batches/bench-context.js";
import { splitList, type BatchesService } from "../batches/batches.service.js";
import type { ObservationsService } from "../observations/observations.service.js";
import type { BenchEnvironment } from "../reports/bench-environment.js";
import type { WindowsService } from "../windows/windows.service.js";
import { composeRoundMail } from "./round-mail.js";

/** A card walks at most this many readings per quantity; beyond, bucket means (a long look-back). */
const CARD_MAX_SAMPLES = 20_000;

/** What a bench's card said when it was checked off, kept for the summary (walk_round_bench.card). */
interface CheckSnapshot {
  period: { fromMs: number; toMs: number };
  quantities: SummaryQuantity[];
  alertIds: number[];
}

interface ScopeBench {
  bench: Bench;
  zone: Zone;
  order: number;
}

interface Scope {
  site: Site;
  zone: Zone | null;
  benches: ScopeBench[];
}

const scopeKeyOf = (siteId: number, zoneId: number | null) => (zoneId === null ? `site:${siteId}` : `zone:${zoneId}`);

const clock = (ms: number, timeZone: string) =>
  new Intl.DateTimeFormat("en-GB", { timeZone, weekday: "short", hour: "2-digit", minute: "2-digit" }).format(ms);

export interface RoundsDeps {
  batches: BatchesService;
  observations: ObservationsService;
  alerts: AlertsService;
  windows: WindowsService;
  environment: BenchEnvironment;
  mailer: Mailer;
  appUrl: () => string;
  logger: Logger;
}

/**
 * Walk-through rounds (issue 6 §3): start or resume, cards per bench in walking order, check-offs,
 * finish → a summary saved with the round and mailed to the managers through the outbox in the
 * same transaction (so a crash neither loses nor doubles it).
 */
export class RoundsService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly deps: RoundsDeps,
    private readonly now: () => number = Date.now,
  ) {}

  // ── rounds ────────────────────────────────────────────────────────────────

  async record(id: number, manager: EntityManager = this.dataSource.manager): Promise<WalkRoundRecord> {
    const round = await manager.getRepository(WalkRoundEntity).findOneBy({ id });
    if (!round) throw notFound("round-not-found", `There is no round ${id}`);
    return round;
  }

  private async scope(round: Pick<WalkRoundRecord, "id" | "siteId" | "zoneId">, checks: WalkRoundBenchRecord[] = []): Promise<Scope> {
    const site = await this.dataSource.getRepository(SiteEntity).findOneByOrFail({ id: round.siteId });
    const zone = round.zoneId === null ? null : await this.dataSource.getRepository(ZoneEntity).findOneByOrFail({ id: round.zoneId });
    const zones = zone ? [zone] : await this.dataSource.getRepository(ZoneEntity).find({ where: { siteId: site.id, archivedAtMs: IsNull() }, order: { position: "ASC", id: "ASC" } });
    const live = zones.length
      ? await this.dataSource.getRepository(BenchEntity).find({ where: { zoneId: In(zones.map((z) => z.id)), archivedAtMs: IsNull() }, order: { position: "ASC", id: "ASC" } })
      : [];
    // Benches checked in the round but archived (or moved away) since still belong to it.
    const extraIds = checks.map((c) => c.benchId).filter((id) => !live.some((b) => b.id === id));
    const extra = extraIds.length ? await this.dataSource.getRepository(BenchEntity).findBy({ id: In(extraIds) }) : [];
    const allZones = [...zones];
    for (const b of extra) if (!allZones.some((z) => z.id === b.zoneId)) allZones.push(await this.dataSource.getRepository(ZoneEntity).findOneByOrFail({ id: b.zoneId }));
    const zoneOrder = (zoneId: number) => allZones.findIndex((z) => z.id === zoneId);
    const benches = [...live, ...extra].sort((a, b) => zoneOrder(a.zoneId) - zoneOrder(b.zoneId) || a.position - b.position || a.id - b.id);
    return { site, zone, benches: benches.map((bench, order) => ({ bench, zone: allZones.find((z) => z.id === bench.zoneId)!, order })) };
  }

  private scopeLabel(scope: Pick<Scope, "site" | "zone">): string {
    return scope.zone ? scope.zone.name : `All zones of ${scope.site.name}`;
  }

  private checkView(c: WalkRoundBenchRecord): BenchCheck {
    return { atMs: c.checkedAtMs, by: { userId: c.checkedByUserId, name: c.checkedByName }, note: c.note };
  }

  private async checksOf(roundId: number): Promise<WalkRoundBenchRecord[]> {
    return this.dataSource.getRepository(WalkRoundBenchEntity).find({ where: { roundId }, order: { checkedAtMs: "ASC", id: "ASC" } });
  }

  private async view(round: WalkRoundRecord): Promise<RoundView> {
    const checks = await this.checksOf(round.id);
    const scope = await this.scope(round, checks);
    const benches: RoundBench[] = scope.benches.map((s) => {
      const check = checks.find((c) => c.benchId === s.bench.id);
      return { benchId: s.bench.id, benchName: s.bench.name, zoneId: s.zone.id, zoneName: s.zone.name, order: s.order, check: check ? this.checkView(check) : null };
    });
    return {
      id: round.id,
      siteId: scope.site.id,
      siteName: scope.site.name,
      timeZone: scope.site.timeZone,
      zoneId: round.zoneId,
      zoneName: scope.zone?.name ?? null,
      scopeLabel: this.scopeLabel(scope),
      status: round.status,
      startedAtMs: round.startedAtMs,
      startedBy: { userId: round.startedByUserId, name: round.startedByName },
      finishedAtMs: round.finishedAtMs,
      finishedBy: round.finishedByName === null ? null : { userId: round.finishedByUserId, name: round.finishedByName },
      benches,
      benchCount: benches.length,
      checkedCount: benches.filter((b) => b.check).length,
    };
  }

  async get(id: number): Promise<RoundView> {
    return this.view(await this.record(id));
  }

  async list(query: RoundsQuery): Promise<RoundView[]> {
    const qb = this.dataSource.getRepository(WalkRoundEntity).createQueryBuilder("r");
    if (query.status !== "all") qb.andWhere("r.status = :status", { status: query.status });
    if (query.siteId !== undefined) qb.andWhere("r.siteId = :siteId", { siteId: query.siteId });
    if (query.zoneId !== undefined) {
      const zone = await this.dataSource.getRepository(ZoneEntity).findOneBy({ id: query.zoneId });
      if (!zone) return [];
      qb.andWhere("(r.zoneId = :zoneId OR (r.zoneId IS NULL AND r.siteId = :zoneSiteId))", { zoneId: zone.id, zoneSiteId: zone.siteId });
    }
    const rows = await qb.orderBy("r.startedAtMs", "DESC").addOrderBy("r.id", "DESC").take(query.limit).getMany();
    const out: RoundView[] = [];
    for (const r of rows) out.push(await this.view(r));
    return out;
  }

  /** Starts a round for a zone or a site, or resumes the one in progress for the same scope. */
  async start(input: StartRoundInput, actor: Principal): Promise<StartRoundResponse> {
    let site: Site;
    let zone: Zone | null = null;
    if (input.zoneId !== undefined) {
      const found = await this.dataSource.getRepository(ZoneEntity).findOneBy({ id: input.zoneId });
      if (!found) throw new AppError("zone-not-found", `There is no zone ${input.zoneId}`, 400, [{ path: "zoneId", message: "Choose an existing zone" }]);
      if (found.archivedAtMs !== null) throw new AppError("zone-archived", `${found.name} is archived`, 409, [{ path: "zoneId", message: "Choose a zone in use" }]);
      zone = found;
      site = await this.dataSource.getRepository(SiteEntity).findOneByOrFail({ id: found.siteId });
    } else if (input.siteId !== undefined) {
      const found = await this.dataSource.getRepository(SiteEntity).findOneBy({ id: input.siteId });
      if (!found) throw new AppError("site-not-found", `There is no site ${input.siteId}`, 400, [{ path: "siteId", message: "Choose an existing site" }]);
      site = found;
    } else {
      const live = await this.dataSource.getRepository(SiteEntity).findBy({ archivedAtMs: IsNull() });
      if (live.length !== 1) throw new AppError("choose-a-site", "Choose a zone or a site for the round", 400, [{ path: "siteId", message: "Choose a site" }]);
      site = live[0]!;
    }
    if (site.archivedAtMs !== null) throw new AppError("site-archived", `${site.name} is archived`, 409);

    const repo = this.dataSource.getRepository(WalkRoundEntity);
    const scopeKey = scopeKeyOf(site.id, zone?.id ?? null);
    const nowMs = this.now();
    const current = await repo.findOneBy({ scopeKey, status: "in-progress" });
    if (current) {
      if (nowMs - current.startedAtMs <= ROUND_STALE_AFTER_MS) return { round: await this.view(current), resumed: true };
      await repo.update({ id: current.id }, { status: "abandoned" });
      this.deps.logger.info({ roundId: current.id }, "stale walk-through abandoned");
    }
    // A zone round and a whole-site round of the same site would check the same benches.
    const overlapping = await repo.findOne({
      where: zone ? { scopeKey: scopeKeyOf(site.id, null), status: "in-progress" } : { siteId: site.id, zoneId: Not(IsNull()), status: "in-progress" },
      order: { startedAtMs: "ASC" },
    });
    if (overlapping && nowMs - overlapping.startedAtMs <= ROUND_STALE_AFTER_MS) {
      const what = overlapping.zoneId === null ? `a round of every zone of ${site.name}` : `a round of ${(await this.dataSource.getRepository(ZoneEntity).findOneBy({ id: overlapping.zoneId }))?.name ?? "a zone"}`;
      throw new AppError("round-overlaps", `${overlapping.startedByName} started ${what} at ${clock(overlapping.startedAtMs, site.timeZone)}; finish or abandon it first, or walk another zone`, 409);
    }
    try {
      const saved = await repo.save({
        siteId: site.id,
        zoneId: zone?.id ?? null,
        scopeKey,
        status: "in-progress",
        startedAtMs: nowMs,
        startedByUserId: actor.userId,
        startedByName: await actorName(this.dataSource.manager, actor),
        finishedAtMs: null,
        finishedByUserId: null,
        finishedByName: null,
        summary: null,
      });
      return { round: await this.view(saved), resumed: false };
    } catch (err) {
      if (!isUniqueViolation(err)) throw err;
      // Started by someone else a moment ago: join it.
      return { round: await this.view(await repo.findOneByOrFail({ scopeKey, status: "in-progress" })), resumed: true };
    }
  }

  async abandon(id: number): Promise<RoundView> {
    const round = await this.record(id);
    if (round.status === "finished") throw new AppError("round-finished", "This round is finished", 409);
    if (round.status === "in-progress") await this.dataSource.getRepository(WalkRoundEntity).update({ id, status: "in-progress" }, { status: "abandoned" });
    return this.get(id);
  }

  // ── cards ─────────────────────────────────────────────────────────────────

  private async scopeBench(round: WalkRoundRecord, benchId: number, checks: WalkRoundBenchRecord[]): Promise<{ scope: Scope; entry: ScopeBench }> {
    const scope = await this.scope(round, checks);
    const entry = scope.benches.find((s) => s.bench.id === benchId);
    if (!entry) throw notFound("bench-not-in-round", `Bench ${benchId} is not part of this round`);
    return { scope, entry };
  }

  /** Where a bench's card starts: its check-off in the last finished round before this one, else 18:00 the evening before. */
  private async periodOf(round: WalkRoundRecord, benchId: number, site: Site, check: WalkRoundBenchRecord | undefined, nowMs: number): Promise<BenchCard["period"]> {
    const toMs = check?.checkedAtMs ?? (round.status === "in-progress" ? nowMs : (round.finishedAtMs ?? nowMs));
    const previous = await this.dataSource
      .getRepository(WalkRoundBenchEntity)
      .createQueryBuilder("c")
      .innerJoin(WalkRoundEntity.options.name, "r", "r.id = c.roundId")
      .where("c.benchId = :benchId", { benchId })
      .andWhere("r.status = 'finished'")
      .andWhere("r.id <> :roundId", { roundId: round.id })
      .andWhere("c.checkedAtMs < :before", { before: round.startedAtMs })
      .orderBy("c.checkedAtMs", "DESC")
      .getOne();
    let fromMs = previous ? previous.checkedAtMs : roundLookbackStartMs(round.startedAtMs, site.timeZone);
    let capped = false;
    if (toMs - fromMs > MAX_CARD_LOOKBACK_MS) {
      fromMs = toMs - MAX_CARD_LOOKBACK_MS;
      capped = true;
    }
    return { fromMs: Math.min(fromMs, toMs), toMs, since: previous ? "last-round" : "evening-before", sinceRoundId: previous?.roundId ?? null, capped };
  }

  private async quantityCards(benchId: number, period: { fromMs: number; toMs: number }): Promise<QuantityCard[]> {
    const cards: QuantityCard[] = [];
    for (const quantity of WINDOWED_QUANTITIES) {
      const w = this.deps.windows.windowFor(benchId, quantity);
      const window = w ? { min: w.min, max: w.max } : null;
      const extremes = await this.deps.environment.extremes(benchId, quantity, period);
      const { result, sampled } = await this.deps.environment.timeInWindow(benchId, quantity, window, period, CARD_MAX_SAMPLES);
      cards.push({
        quantity,
        window,
        min: extremes?.min ?? null,
        max: extremes?.max ?? null,
        readingCount: extremes?.count ?? 0,
        minutes: result.minutes,
        minutesOutOfWindow: Math.round(result.minutes.below + result.minutes.above),
        insidePct: result.insidePctOfData,
        sampled,
      });
    }
    return cards;
  }

  private async alertsIn(benchId: number, period: { fromMs: number; toMs: number }) {
    const rows = await this.dataSource
      .getRepository(AlertEntity)
      .createQueryBuilder("a")
      .where("a.benchId = :benchId", { benchId })
      .andWhere("a.sinceMs < :toMs", { toMs: period.toMs })
      .andWhere("(a.clearedAtMs IS NULL OR a.clearedAtMs >= :fromMs)", { fromMs: period.fromMs })
      .orderBy("a.sinceMs", "ASC")
      .getMany();
    const views = await this.deps.alerts.views(rows.map((r) => r.id));
    return views.sort((a, b) => a.sinceMs - b.sinceMs || a.id - b.id);
  }

  private async cardBatches(roundId: number, benchId: number): Promise<CardBatch[]> {
    const batches = await this.deps.batches.views(await this.deps.batches.find({ status: "open", benchId }, 500));
    const thisRound = await this.deps.observations.forRound(roundId, batches.map((b) => b.id));
    return batches
      .sort((a, b) => a.stuckOn.localeCompare(b.stuckOn) || a.id - b.id)
      .map((b) => ({
        id: b.id,
        variety: b.variety,
        stuckOn: b.stuckOn,
        ageDays: b.ageDays,
        countStuck: b.countStuck,
        stage: b.stage,
        tally: b.tally,
        lastObservation: b.lastObservation,
        observationsThisRound: thisRound.get(b.id) ?? [],
      }));
  }

  private async cardOf(round: WalkRoundRecord, scope: Scope, entry: ScopeBench, check: WalkRoundBenchRecord | undefined, nowMs: number): Promise<BenchCard> {
    await this.deps.windows.ready();
    const period = await this.periodOf(round, entry.bench.id, scope.site, check, nowMs);
    const air = await this.deps.environment.airMoisture(entry.bench.id, period, CARD_MAX_SAMPLES);
    return {
      roundId: round.id,
      benchId: entry.bench.id,
      benchName: entry.bench.name,
      zoneId: entry.zone.id,
      zoneName: entry.zone.name,
      order: entry.order,
      period,
      quantities: await this.quantityCards(entry.bench.id, period),
      air: {
        pairCount: air.pairCount,
        dewPointC: air.dewPoint,
        vpdKPa: air.vpd,
        dewPointMarginC: air.dewPointMargin ? { min: air.dewPointMargin, alertMarginC: this.deps.windows.dewPointMarginFor(entry.bench.id) } : null,
      },
      alerts: await this.alertsIn(entry.bench.id, period),
      batches: await this.cardBatches(round.id, entry.bench.id),
      check: check ? this.checkView(check) : null,
    };
  }

  async cards(id: number): Promise<{ round: RoundView; cards: BenchCard[] }> {
    const round = await this.record(id);
    const checks = await this.checksOf(id);
    const scope = await this.scope(round, checks);
    const nowMs = this.now();
    const cards: BenchCard[] = [];
    for (const entry of scope.benches) cards.push(await this.cardOf(round, scope, entry, checks.find((c) => c.benchId === entry.bench.id), nowMs));
    return { round: await this.view(round), cards };
  }

  async card(id: number, benchId: number): Promise<BenchCard> {
    const round = await this.record(id);
    const checks = await this.checksOf(id);
    const { scope, entry } = await this.scopeBench(round, benchId, checks);
    return this.cardOf(round, scope, entry, checks.find((c) => c.benchId === benchId), this.now());
  }

  // ── check-offs ────────────────────────────────────────────────────────────

  private assertInProgress(round: WalkRoundRecord): void {
    if (round.status !== "in-progress") throw new AppError("round-not-in-progress", `This round is ${round.status}`, 409);
  }

  /** Checks a bench off (idempotent: the first check-off stays; a note given later replaces the note). */
  async check(id: number, benchId: number, input: CheckBenchInput, actor: Principal): Promise<{ bench: RoundBench; round: RoundView }> {
    const round = await this.record(id);
    this.assertInProgress(round);
    const repo = this.dataSource.getRepository(WalkRoundBenchEntity);
    const checks = await this.checksOf(id);
    const { scope, entry } = await this.scopeBench(round, benchId, checks);
    const existing = checks.find((c) => c.benchId === benchId);
    if (existing) {
      if (input.note !== undefined && input.note !== existing.note) await repo.update({ id: existing.id }, { note: input.note });
    } else {
      // The tablet's time of the tap (an offline check-off arrives later), held between the
      // round's start and now so a wrong tablet clock cannot put it outside the round.
      const nowMs = input.checkedAtMs === undefined ? this.now() : Math.min(this.now(), Math.max(round.startedAtMs, input.checkedAtMs));
      const card = await this.cardOf(round, scope, entry, undefined, nowMs);
      const snapshot: CheckSnapshot = {
        period: { fromMs: card.period.fromMs, toMs: card.period.toMs },
        quantities: card.quantities.map((q) => ({
          quantity: q.quantity,
          readingCount: q.readingCount,
          belowMinutes: Math.round(q.minutes.below),
          aboveMinutes: Math.round(q.minutes.above),
          noDataMinutes: Math.round(q.minutes.noData),
          min: q.min?.value ?? null,
          max: q.max?.value ?? null,
          windowMin: q.window?.min ?? null,
          windowMax: q.window?.max ?? null,
        })),
        alertIds: card.alerts.map((a) => a.id),
      };
      try {
        await repo.insert({
          roundId: id,
          benchId,
          checkedAtMs: nowMs,
          checkedByUserId: actor.userId,
          checkedByName: await actorName(this.dataSource.manager, actor),
          note: input.note ?? null,
          card: JSON.stringify(snapshot),
        });
      } catch (err) {
        if (!isUniqueViolation(err)) throw err; // checked by a retry a moment ago: that check stands
      }
    }
    const view = await this.get(id);
    return { bench: view.benches.find((b) => b.benchId === benchId)!, round: view };
  }

  async uncheck(id: number, benchId: number): Promise<{ bench: RoundBench; round: RoundView }> {
    const round = await this.record(id);
    this.assertInProgress(round);
    await this.scopeBench(round, benchId, await this.checksOf(id));
    await this.dataSource.getRepository(WalkRoundBenchEntity).delete({ roundId: id, benchId });
    const view = await this.get(id);
    return { bench: view.benches.find((b) => b.benchId === benchId)!, round: view };
  }

  // ── finishing ─────────────────────────────────────────────────────────────

  private async managers(manager: EntityManager): Promise<UserRecord[]> {
    // Like the alert notifier: the managers; the admins when there is no active manager.
    const users = await manager.getRepository(UserEntity).find({ where: { disabled: false }, order: { id: "ASC" } });
    const managers = users.filter((u) => u.role === "manager");
    return managers.length > 0 ? managers : users.filter((u) => u.role === "admin");
  }

  private async buildSummary(round: WalkRoundRecord, finishedAtMs: number, finishedBy: { userId: number; name: string }, manager: EntityManager): Promise<Omit<RoundSummary, "mailedTo">> {
    const checks = await manager.getRepository(WalkRoundBenchEntity).find({ where: { roundId: round.id }, order: { checkedAtMs: "ASC", id: "ASC" } });
    const scope = await this.scope(round, checks);
    const benchIds = scope.benches.map((s) => s.bench.id);
    const entryOf = new Map(scope.benches.map((s) => [s.bench.id, s]));

    // Observations of the round: sent with its id, or recorded meanwhile on a batch in its scope.
    const withId = await manager.getRepository(ObservationEntity).findBy({ roundId: round.id });
    const meanwhile = await manager
      .getRepository(ObservationEntity)
      .createQueryBuilder("o")
      .innerJoin(BatchEntity.options.name, "b", "b.id = o.batchId")
      .where("o.roundId IS NULL")
      .andWhere("o.recordedAtMs >= :from AND o.recordedAtMs <= :to", { from: round.startedAtMs, to: finishedAtMs })
      .andWhere(benchIds.length ? "b.benchId IN (:...benchIds)" : "1 = 0", { benchIds })
      .getMany();
    const observations = [...withId, ...meanwhile];
    const batches = observations.length ? await manager.getRepository(BatchEntity).findBy({ id: In([...new Set(observations.map((o) => o.batchId))]) }) : [];
    const photos = observations.length ? await manager.getRepository(ObservationPhotoEntity).findBy({ observationId: In(observations.map((o) => o.id)) }) : [];
    const photoCount = (observationId: number) => photos.filter((p) => p.observationId === observationId).length;

    const snapshots = new Map(checks.map((c) => [c.benchId, JSON.parse(c.card) as CheckSnapshot]));
    const alertIds = [...new Set([...snapshots.values()].flatMap((s) => s.alertIds))];
    const alerts = alertIds.length ? await manager.getRepository(AlertEntity).findBy({ id: In(alertIds) }) : [];
    const alertViews = await this.deps.alerts.views(alerts.map((a) => a.id));

    const benchName = (benchId: number) => entryOf.get(benchId)?.bench.name ?? `Bench ${benchId}`;
    const zoneName = (benchId: number) => entryOf.get(benchId)?.zone.name ?? "";
    const flagged = observations
      .filter((o) => o.flags !== "")
      .sort((a, b) => a.recordedAtMs - b.recordedAtMs)
      .map((o) => {
        const batch = batches.find((b) => b.id === o.batchId);
        const benchId = batch?.benchId ?? 0;
        return {
          observationId: o.id,
          batchId: o.batchId,
          variety: batch?.variety ?? "",
          benchId,
          benchName: benchName(benchId),
          zoneName: zoneName(benchId),
          stage: o.stage,
          flags: splitList<ObservationFlag>(o.flags),
          note: o.note,
          photoCount: photoCount(o.id),
        };
      });
    const summaryAlerts = alertViews
      .sort((a, b) => a.sinceMs - b.sinceMs || a.id - b.id)
      .map((a) => ({
        alertId: a.id,
        benchId: a.benchId,
        benchName: a.benchName,
        zoneName: a.zoneName,
        summary: a.summary,
        phase: a.phase,
        sinceMs: a.sinceMs,
        clearedAtMs: a.clearedAtMs,
        quantity: a.quantity,
        worstValue: a.worstValue,
      }));
    const walkedBy = [...new Set([...checks.map((c) => c.checkedByName), ...observations.map((o) => o.recordedByName)])];
    const checkOf = (benchId: number) => checks.find((c) => c.benchId === benchId);
    return {
      roundId: round.id,
      siteName: scope.site.name,
      scopeLabel: this.scopeLabel(scope),
      timeZone: scope.site.timeZone,
      startedAtMs: round.startedAtMs,
      startedBy: { userId: round.startedByUserId, name: round.startedByName },
      finishedAtMs,
      finishedBy,
      walkedBy,
      benchCount: scope.benches.length,
      checkedCount: checks.filter((c) => entryOf.has(c.benchId)).length,
      benches: scope.benches.map((s) => {
        const check = checkOf(s.bench.id);
        const snapshot = snapshots.get(s.bench.id);
        return {
          benchId: s.bench.id,
          benchName: s.bench.name,
          zoneName: s.zone.name,
          check: check ? this.checkView(check) : null,
          period: snapshot?.period ?? null,
          quantities: snapshot?.quantities ?? [],
          outOfWindow: (snapshot?.quantities ?? []).filter((q) => q.belowMinutes + q.aboveMinutes > 0),
          alertIds: snapshot?.alertIds ?? [],
        };
      }),
      notChecked: scope.benches.filter((s) => !checkOf(s.bench.id)).map((s) => ({ benchId: s.bench.id, benchName: s.bench.name, zoneName: s.zone.name })),
      problems: { count: summaryAlerts.length + flagged.length, alerts: summaryAlerts, observations: flagged },
      observationCount: observations.length,
      photoCount: photos.length,
    };
  }

  /**
   * Finishes the round: the summary is saved with it and one e-mail per manager is written to the
   * outbox in the same transaction. Finishing a finished round answers its saved summary again.
   */
  async finish(id: number, actor: Principal): Promise<{ round: RoundView; summary: RoundSummary }> {
    const round = await this.record(id);
    if (round.status === "finished") return this.summary(id);
    if (round.status === "abandoned") throw new AppError("round-abandoned", "This round was abandoned; start a new one", 409);
    await this.deps.windows.ready();
    const finishedAtMs = this.now();
    const done = await this.dataSource.transaction(async (tx) => {
      const name = await actorName(tx, actor);
      const claimed = await tx.getRepository(WalkRoundEntity).update({ id, status: "in-progress" }, { status: "finished", finishedAtMs, finishedByUserId: actor.userId, finishedByName: name });
      if (!claimed.affected) return false; // finished by another request meanwhile
      const base = await this.buildSummary(round, finishedAtMs, { userId: actor.userId, name }, tx);
      const recipients = await this.managers(tx);
      const summary: RoundSummary = { ...base, mailedTo: recipients.map((u) => u.email) };
      await tx.getRepository(WalkRoundEntity).update({ id }, { summary: JSON.stringify(summary) });
      for (const user of recipients) {
        const mail = composeRoundMail(summary, { name: user.name, unit: user.temperatureUnit as TemperatureUnit }, this.deps.appUrl());
        await this.deps.mailer.enqueue({ to: user.email, subject: mail.subject, text: mail.text, html: mail.html }, tx);
      }
      if (recipients.length === 0) this.deps.logger.warn({ roundId: id }, "walk-through summary with nobody to mail: no active manager or admin");
      return true;
    });
    if (!done) this.deps.logger.debug({ roundId: id }, "round finished by another request");
    return this.summary(id);
  }

  async summary(id: number): Promise<{ round: RoundView; summary: RoundSummary }> {
    const round = await this.record(id);
    if (round.status !== "finished" || round.summary === null) throw new AppError("round-not-finished", "This round is not finished yet", 409);
    return { round: await this.view(round), summary: JSON.parse(round.summary) as RoundSummary };
  }
}
