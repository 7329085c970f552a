import { In, IsNull, type DataSource, type EntityManager } from "typeorm";
import { DEFAULT_PRESET_ID } from "../../../shared/domain/window-guidance.js";
import type {
  BenchView,
  CreateBenchInput,
  CreateSiteInput,
  CreateZoneInput,
  LayoutResponse,
  SiteView,
  UpdateBenchInput,
  UpdateSiteInput,
  UpdateZoneInput,
  ZoneView,
} from "../../../shared/schemas/layout.js";
import { BenchEntity, type Bench } from "../../db/entities/bench.entity.js";
import { SensorEntity, type Sensor } from "../../db/entities/sensor.entity.js";
import { SiteEntity, type Site } from "../../db/entities/site.entity.js";
import { ZoneEntity, type Zone } from "../../db/entities/zone.entity.js";
import type { Principal } from "../../lib/auth.js";
import { AppError, notFound } from "../../lib/errors.js";
import { auditChange, changedFields, writeAuditEntry } from "../audit/audit.service.js";
import { benchSubject, windowSetChanges, writeZoneWindows, type WindowSettingsService } from "../windows/window-settings.service.js";
import type { WindowsService } from "../windows/windows.service.js";

function siteView(s: Site): SiteView {
  return { id: s.id, name: s.name, timeZone: s.timeZone, createdAtMs: s.createdAtMs, archivedAtMs: s.archivedAtMs };
}

function zoneView(z: Zone): ZoneView {
  return { id: z.id, siteId: z.siteId, name: z.name, position: z.position, archivedAtMs: z.archivedAtMs };
}

const sameName = (a: string, b: string) => a.trim().toLowerCase() === b.trim().toLowerCase();

const nameTaken = (what: string, name: string) =>
  new AppError(`${what}-name-taken`, `There is already a ${what} called ${name} here`, 409, [{ path: "name", message: "This name is taken" }]);

/**
 * Sites, zones and benches: create, edit, move, order, archive and restore, each change audited in
 * its own transaction. Archiving never deletes: readings, windows, audit and assignment history stay.
 * Archiving a site or zone archives what is in it; restoring brings back what was archived with it.
 * Something still measuring cannot be archived: move or unassign its sensors first.
 */
export class LayoutService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly windows: WindowsService,
    private readonly settings: WindowSettingsService,
    private readonly now: () => number = Date.now,
  ) {}

  // ── reading ───────────────────────────────────────────────────────────────

  private benchViews(benches: Bench[], sensors: Sensor[], withOverrides: Set<number>): BenchView[] {
    return benches.map((b) => ({
      id: b.id,
      zoneId: b.zoneId,
      name: b.name,
      position: b.position,
      archivedAtMs: b.archivedAtMs,
      sensors: sensors.filter((s) => s.benchId === b.id).map((s) => ({ id: s.id, kind: s.kind })),
      hasWindowOverrides: withOverrides.has(b.id),
    }));
  }

  private async views(sites: Site[], zones: Zone[], benches: Bench[]): Promise<LayoutResponse> {
    const [sensors, withOverrides] = await Promise.all([
      benches.length ? this.dataSource.getRepository(SensorEntity).find({ where: { benchId: In(benches.map((b) => b.id)) }, order: { id: "ASC" } }) : Promise.resolve([]),
      this.settings.benchesWithOverrides(),
    ]);
    return { sites: sites.map(siteView), zones: zones.map(zoneView), benches: this.benchViews(benches, sensors, withOverrides) };
  }

  async layout(includeArchived: boolean): Promise<LayoutResponse> {
    const live = includeArchived ? {} : { archivedAtMs: IsNull() };
    const [sites, zones, benches] = await Promise.all([
      this.dataSource.getRepository(SiteEntity).find({ where: live, order: { id: "ASC" } }),
      this.dataSource.getRepository(ZoneEntity).find({ where: live, order: { siteId: "ASC", position: "ASC", id: "ASC" } }),
      this.dataSource.getRepository(BenchEntity).find({ where: live, order: { zoneId: "ASC", position: "ASC", id: "ASC" } }),
    ]);
    // Without archived items, nothing under an archived parent either.
    const liveZones = zones.filter((z) => sites.some((s) => s.id === z.siteId));
    return this.views(sites, liveZones, benches.filter((b) => liveZones.some((z) => z.id === b.zoneId)));
  }

  private async site(id: number, manager: EntityManager = this.dataSource.manager): Promise<Site> {
    const site = await manager.getRepository(SiteEntity).findOneBy({ id });
    if (!site) throw notFound("site-not-found", `There is no site ${id}`);
    return site;
  }

  private async zone(id: number, manager: EntityManager = this.dataSource.manager): Promise<Zone> {
    const zone = await manager.getRepository(ZoneEntity).findOneBy({ id });
    if (!zone) throw notFound("zone-not-found", `There is no zone ${id}`);
    return zone;
  }

  private async bench(id: number, manager: EntityManager = this.dataSource.manager): Promise<Bench> {
    const bench = await manager.getRepository(BenchEntity).findOneBy({ id });
    if (!bench) throw notFound("bench-not-found", `There is no bench ${id}`);
    return bench;
  }

  private async benchView(id: number): Promise<BenchView> {
    const bench = await this.bench(id);
    return (await this.views([], [], [bench])).benches[0]!;
  }

  /** Refuses to archive benches that still carry sensors: their readings would land on an archived bench. */
  private async assertNoSensors(benchIds: number[]): Promise<void> {
    if (benchIds.length === 0) return;
    const sensors = await this.dataSource.getRepository(SensorEntity).find({ where: { benchId: In(benchIds) }, order: { id: "ASC" } });
    if (sensors.length > 0) {
      const ids = sensors.map((s) => s.id).join(", ");
      throw new AppError("sensors-still-assigned", `Move or unassign the sensors first (${ids}); their readings would land on an archived bench`, 409);
    }
  }

  // ── sites (admin) ─────────────────────────────────────────────────────────

  async createSite(input: CreateSiteInput, actor: Principal): Promise<SiteView> {
    const live = await this.dataSource.getRepository(SiteEntity).findBy({ archivedAtMs: IsNull() });
    if (live.some((s) => sameName(s.name, input.name))) throw nameTaken("site", input.name);
    const atMs = this.now();
    const site = await this.dataSource.transaction(async (tx) => {
      const saved = await tx.getRepository(SiteEntity).save({ name: input.name, timeZone: input.timeZone, createdAtMs: atMs, archivedAtMs: null });
      await writeAuditEntry(
        tx,
        { entityType: "site", entityId: saved.id, action: "created", subject: saved.name, siteId: saved.id, changes: changedFields(null, saved, { name: "text", timeZone: "text" }) },
        atMs,
        actor,
      );
      return saved;
    });
    return siteView(site);
  }

  async updateSite(id: number, input: UpdateSiteInput, actor: Principal): Promise<SiteView> {
    const before = await this.site(id);
    if (input.name !== undefined) {
      const live = await this.dataSource.getRepository(SiteEntity).findBy({ archivedAtMs: IsNull() });
      if (live.some((s) => s.id !== id && sameName(s.name, input.name!))) throw nameTaken("site", input.name);
    }
    const after: Site = { ...before, name: input.name ?? before.name, timeZone: input.timeZone ?? before.timeZone };
    const changes = changedFields(before, after, { name: "text", timeZone: "text" });
    if (changes.length > 0) {
      await this.dataSource.transaction(async (tx) => {
        await tx.getRepository(SiteEntity).update({ id }, { name: after.name, timeZone: after.timeZone });
        await writeAuditEntry(tx, { entityType: "site", entityId: id, action: "updated", subject: after.name, siteId: id, changes }, this.now(), actor);
      });
    }
    return siteView(await this.site(id));
  }

  /** Archives the site with its zones and benches. */
  async archiveSite(id: number, actor: Principal): Promise<LayoutResponse> {
    const site = await this.site(id);
    if (site.archivedAtMs !== null) throw new AppError("already-archived", `${site.name} is already archived`, 409);
    const zones = await this.dataSource.getRepository(ZoneEntity).findBy({ siteId: id, archivedAtMs: IsNull() });
    const benches = zones.length ? await this.dataSource.getRepository(BenchEntity).findBy({ zoneId: In(zones.map((z) => z.id)), archivedAtMs: IsNull() }) : [];
    await this.assertNoSensors(benches.map((b) => b.id));
    const atMs = this.now();
    await this.dataSource.transaction(async (tx) => {
      await tx.getRepository(SiteEntity).update({ id }, { archivedAtMs: atMs });
      const note = zones.length ? `Archived with ${zones.length} zone(s) and ${benches.length} bench(es)` : null;
      await writeAuditEntry(tx, { entityType: "site", entityId: id, action: "archived", subject: site.name, siteId: id, changes: [auditChange("archivedAtMs", "time", null, atMs)], note }, atMs, actor);
      await this.archiveZonesAndBenches(tx, zones, benches, atMs, actor, `Archived with site ${site.name}`);
    });
    await this.windows.reload();
    return this.views([await this.site(id)], await this.refetchZones(zones), await this.refetchBenches(benches));
  }

  async restoreSite(id: number, actor: Principal): Promise<LayoutResponse> {
    const site = await this.site(id);
    if (site.archivedAtMs === null) throw new AppError("not-archived", `${site.name} is not archived`, 409);
    const live = await this.dataSource.getRepository(SiteEntity).findBy({ archivedAtMs: IsNull() });
    if (live.some((s) => sameName(s.name, site.name))) throw nameTaken("site", site.name);
    const zones = await this.dataSource.getRepository(ZoneEntity).findBy({ siteId: id, archivedAtMs: site.archivedAtMs });
    const benches = zones.length ? await this.dataSource.getRepository(BenchEntity).findBy({ zoneId: In(zones.map((z) => z.id)), archivedAtMs: site.archivedAtMs }) : [];
    const atMs = this.now();
    await this.dataSource.transaction(async (tx) => {
      await tx.getRepository(SiteEntity).update({ id }, { archivedAtMs: null });
      await writeAuditEntry(tx, { entityType: "site", entityId: id, action: "restored", subject: site.name, siteId: id, changes: [auditChange("archivedAtMs", "time", site.archivedAtMs, null)] }, atMs, actor);
      await this.restoreZonesAndBenches(tx, zones, benches, atMs, actor, `Restored with site ${site.name}`);
    });
    await this.windows.reload();
    return this.views([await this.site(id)], await this.refetchZones(zones), await this.refetchBenches(benches));
  }

  private async refetchZones(zones: Zone[]): Promise<Zone[]> {
    return zones.length ? this.dataSource.getRepository(ZoneEntity).find({ where: { id: In(zones.map((z) => z.id)) }, order: { position: "ASC", id: "ASC" } }) : [];
  }

  private async refetchBenches(benches: Bench[]): Promise<Bench[]> {
    return benches.length ? this.dataSource.getRepository(BenchEntity).find({ where: { id: In(benches.map((b) => b.id)) }, order: { zoneId: "ASC", position: "ASC", id: "ASC" } }) : [];
  }

  private async archiveZonesAndBenches(tx: EntityManager, zones: Zone[], benches: Bench[], atMs: number, actor: Principal, note: string): Promise<void> {
    for (const zone of zones) {
      await tx.getRepository(ZoneEntity).update({ id: zone.id }, { archivedAtMs: atMs });
      await writeAuditEntry(tx, { entityType: "zone", entityId: zone.id, action: "archived", subject: zone.name, siteId: zone.siteId, zoneId: zone.id, changes: [auditChange("archivedAtMs", "time", null, atMs)], note }, atMs, actor);
    }
    for (const bench of benches) {
      const zone = zones.find((z) => z.id === bench.zoneId) ?? (await this.zone(bench.zoneId, tx));
      await tx.getRepository(BenchEntity).update({ id: bench.id }, { archivedAtMs: atMs });
      await writeAuditEntry(
        tx,
        { entityType: "bench", entityId: bench.id, action: "archived", subject: benchSubject(zone, bench), siteId: zone.siteId, zoneId: zone.id, benchId: bench.id, changes: [auditChange("archivedAtMs", "time", null, atMs)], note },
        atMs,
        actor,
      );
    }
  }

  private async restoreZonesAndBenches(tx: EntityManager, zones: Zone[], benches: Bench[], atMs: number, actor: Principal, note: string): Promise<void> {
    for (const zone of zones) {
      await tx.getRepository(ZoneEntity).update({ id: zone.id }, { archivedAtMs: null });
      await writeAuditEntry(tx, { entityType: "zone", entityId: zone.id, action: "restored", subject: zone.name, siteId: zone.siteId, zoneId: zone.id, changes: [auditChange("archivedAtMs", "time", zone.archivedAtMs, null)], note }, atMs, actor);
    }
    for (const bench of benches) {
      const zone = zones.find((z) => z.id === bench.zoneId) ?? (await this.zone(bench.zoneId, tx));
      await tx.getRepository(BenchEntity).update({ id: bench.id }, { archivedAtMs: null });
      await writeAuditEntry(
        tx,
        { entityType: "bench", entityId: bench.id, action: "restored", subject: benchSubject(zone, bench), siteId: zone.siteId, zoneId: zone.id, benchId: bench.id, changes: [auditChange("archivedAtMs", "time", bench.archivedAtMs, null)], note },
        atMs,
        actor,
      );
    }
  }

  // ── zones (admin) ─────────────────────────────────────────────────────────

  private async assertZoneNameFree(siteId: number, name: string, exceptId?: number): Promise<void> {
    const live = await this.dataSource.getRepository(ZoneEntity).findBy({ siteId, archivedAtMs: IsNull() });
    if (live.some((z) => z.id !== exceptId && sameName(z.name, name))) throw nameTaken("zone", name);
  }

  async createZone(input: CreateZoneInput, actor: Principal): Promise<ZoneView> {
    const site = await this.site(input.siteId);
    if (site.archivedAtMs !== null) throw new AppError("site-archived", `${site.name} is archived`, 409, [{ path: "siteId", message: "Choose a site in use" }]);
    await this.assertZoneNameFree(site.id, input.name);
    const presetId = input.presetId === undefined ? DEFAULT_PRESET_ID : input.presetId;
    const preset = presetId === null ? null : await this.settings.findPreset(presetId);
    const siblings = await this.dataSource.getRepository(ZoneEntity).findBy({ siteId: site.id });
    const position = input.position ?? siblings.reduce((max, z) => Math.max(max, z.position + 1), 0);
    const atMs = this.now();
    const zone = await this.dataSource.transaction(async (tx) => {
      const saved = await tx.getRepository(ZoneEntity).save({ siteId: site.id, name: input.name, position, archivedAtMs: null, dewPointMarginC: preset?.dewPointMarginC ?? undefined });
      await writeAuditEntry(
        tx,
        {
          entityType: "zone",
          entityId: saved.id,
          action: "created",
          subject: saved.name,
          siteId: site.id,
          zoneId: saved.id,
          changes: [auditChange("siteId", "reference", null, site.id, { newLabel: site.name }), ...changedFields(null, saved, { name: "text", position: "number" })],
        },
        atMs,
        actor,
      );
      if (preset) {
        const set = { windows: preset.windows, dewPointMarginC: preset.dewPointMarginC };
        await writeZoneWindows(tx, saved.id, set);
        await writeAuditEntry(
          tx,
          {
            entityType: "zone-windows",
            entityId: saved.id,
            action: "preset-applied",
            subject: saved.name,
            siteId: site.id,
            zoneId: saved.id,
            changes: windowSetChanges({ windows: [], dewPointMarginC: null }, set),
            note: `Preset “${preset.name}” applied`,
          },
          atMs,
          actor,
        );
      }
      return saved;
    });
    await this.windows.reload();
    return zoneView(await this.zone(zone.id));
  }

  async updateZone(id: number, input: UpdateZoneInput, actor: Principal): Promise<ZoneView> {
    const before = await this.zone(id);
    if (input.name !== undefined) await this.assertZoneNameFree(before.siteId, input.name, id);
    const after: Zone = { ...before, name: input.name ?? before.name, position: input.position ?? before.position };
    const changes = changedFields(before, after, { name: "text", position: "number" });
    if (changes.length > 0) {
      await this.dataSource.transaction(async (tx) => {
        await tx.getRepository(ZoneEntity).update({ id }, { name: after.name, position: after.position });
        await writeAuditEntry(tx, { entityType: "zone", entityId: id, action: "updated", subject: after.name, siteId: after.siteId, zoneId: id, changes }, this.now(), actor);
      });
    }
    return zoneView(await this.zone(id));
  }

  /** Archives the zone with its benches. */
  async archiveZone(id: number, actor: Principal): Promise<LayoutResponse> {
    const zone = await this.zone(id);
    if (zone.archivedAtMs !== null) throw new AppError("already-archived", `${zone.name} is already archived`, 409);
    const benches = await this.dataSource.getRepository(BenchEntity).findBy({ zoneId: id, archivedAtMs: IsNull() });
    await this.assertNoSensors(benches.map((b) => b.id));
    await this.dataSource.transaction((tx) => this.archiveZonesAndBenches(tx, [zone], benches, this.now(), actor, `Archived with zone ${zone.name}`));
    await this.windows.reload();
    return this.views([], [await this.zone(id)], await this.refetchBenches(benches));
  }

  async restoreZone(id: number, actor: Principal): Promise<LayoutResponse> {
    const zone = await this.zone(id);
    if (zone.archivedAtMs === null) throw new AppError("not-archived", `${zone.name} is not archived`, 409);
    const site = await this.site(zone.siteId);
    if (site.archivedAtMs !== null) throw new AppError("site-archived", `Restore the site ${site.name} first`, 409);
    await this.assertZoneNameFree(zone.siteId, zone.name, id);
    const benches = await this.dataSource.getRepository(BenchEntity).findBy({ zoneId: id, archivedAtMs: zone.archivedAtMs });
    await this.dataSource.transaction((tx) => this.restoreZonesAndBenches(tx, [zone], benches, this.now(), actor, `Restored with zone ${zone.name}`));
    await this.windows.reload();
    return this.views([], [await this.zone(id)], await this.refetchBenches(benches));
  }

  // ── benches (admin, manager) ──────────────────────────────────────────────

  private async liveZone(id: number, path = "zoneId"): Promise<Zone> {
    const zone = await this.dataSource.getRepository(ZoneEntity).findOneBy({ id });
    if (!zone) throw new AppError("zone-not-found", `There is no zone ${id}`, 400, [{ path, message: "Choose an existing zone" }]);
    if (zone.archivedAtMs !== null) throw new AppError("zone-archived", `${zone.name} is archived`, 409, [{ path, message: "Choose a zone in use" }]);
    return zone;
  }

  private async assertBenchNameFree(zoneId: number, name: string, exceptId?: number): Promise<void> {
    const live = await this.dataSource.getRepository(BenchEntity).findBy({ zoneId, archivedAtMs: IsNull() });
    if (live.some((b) => b.id !== exceptId && sameName(b.name, name))) throw nameTaken("bench", name);
  }

  async createBench(input: CreateBenchInput, actor: Principal): Promise<BenchView> {
    const zone = await this.liveZone(input.zoneId);
    await this.assertBenchNameFree(zone.id, input.name);
    const siblings = await this.dataSource.getRepository(BenchEntity).findBy({ zoneId: zone.id });
    const position = input.position ?? siblings.reduce((max, b) => Math.max(max, b.position + 1), 0);
    const atMs = this.now();
    const bench = await this.dataSource.transaction(async (tx) => {
      const saved = await tx.getRepository(BenchEntity).save({ zoneId: zone.id, name: input.name, position, archivedAtMs: null, dewPointMarginC: null });
      await writeAuditEntry(
        tx,
        {
          entityType: "bench",
          entityId: saved.id,
          action: "created",
          subject: benchSubject(zone, saved),
          siteId: zone.siteId,
          zoneId: zone.id,
          benchId: saved.id,
          changes: [auditChange("zoneId", "reference", null, zone.id, { newLabel: zone.name }), ...changedFields(null, saved, { name: "text", position: "number" })],
        },
        atMs,
        actor,
      );
      return saved;
    });
    await this.windows.reload();
    return this.benchView(bench.id);
  }

  /** Renames, re-orders or moves a bench to another zone (its readings and overrides go with it). */
  async updateBench(id: number, input: UpdateBenchInput, actor: Principal): Promise<BenchView> {
    const before = await this.bench(id);
    if (before.archivedAtMs !== null) throw new AppError("bench-archived", `${before.name} is archived; restore it first`, 409);
    const fromZone = await this.zone(before.zoneId);
    const toZone = input.zoneId !== undefined && input.zoneId !== before.zoneId ? await this.liveZone(input.zoneId) : fromZone;
    const after: Bench = { ...before, name: input.name ?? before.name, position: input.position ?? before.position, zoneId: toZone.id };
    if (input.name !== undefined || toZone.id !== fromZone.id) await this.assertBenchNameFree(toZone.id, after.name, id);
    const changes = [
      ...(toZone.id !== fromZone.id ? [auditChange("zoneId", "reference", fromZone.id, toZone.id, { oldLabel: fromZone.name, newLabel: toZone.name })] : []),
      ...changedFields(before, after, { name: "text", position: "number" }),
    ];
    if (changes.length > 0) {
      await this.dataSource.transaction(async (tx) => {
        await tx.getRepository(BenchEntity).update({ id }, { name: after.name, position: after.position, zoneId: after.zoneId });
        await writeAuditEntry(
          tx,
          {
            entityType: "bench",
            entityId: id,
            action: "updated",
            subject: benchSubject(toZone, after),
            siteId: toZone.siteId,
            zoneId: toZone.id,
            previousZoneId: toZone.id !== fromZone.id ? fromZone.id : null,
            benchId: id,
            changes,
          },
          this.now(),
          actor,
        );
      });
      await this.windows.reload();
    }
    return this.benchView(id);
  }

  async archiveBench(id: number, actor: Principal): Promise<LayoutResponse> {
    const bench = await this.bench(id);
    if (bench.archivedAtMs !== null) throw new AppError("already-archived", `${bench.name} is already archived`, 409);
    await this.assertNoSensors([id]);
    const zone = await this.zone(bench.zoneId);
    await this.dataSource.transaction((tx) => this.archiveZonesAndBenches(tx, [], [bench], this.now(), actor, `Archived from ${zone.name}`));
    await this.windows.reload();
    return this.views([], [], [await this.bench(id)]);
  }

  async restoreBench(id: number, actor: Principal): Promise<LayoutResponse> {
    const bench = await this.bench(id);
    if (bench.archivedAtMs === null) throw new AppError("not-archived", `${bench.name} is not archived`, 409);
    const zone = await this.zone(bench.zoneId);
    if (zone.archivedAtMs !== null) throw new AppError("zone-archived", `Restore the zone ${zone.name} first`, 409);
    await this.assertBenchNameFree(zone.id, bench.name, id);
    await this.dataSource.transaction((tx) => this.restoreZonesAndBenches(tx, [], [bench], this.now(), actor, `Restored to ${zone.name}`));
    await this.windows.reload();
    return this.views([], [], [await this.bench(id)]);
  }

  /** Puts every live bench of a zone in a new walking order (positions 0, 1, 2, …). */
  async reorderBenches(zoneId: number, benchIds: number[], actor: Principal): Promise<LayoutResponse> {
    const zone = await this.zone(zoneId);
    const live = await this.dataSource.getRepository(BenchEntity).find({ where: { zoneId, archivedAtMs: IsNull() }, order: { position: "ASC", id: "ASC" } });
    const liveIds = new Set(live.map((b) => b.id));
    if (benchIds.length !== live.length || benchIds.some((id) => !liveIds.has(id))) {
      throw new AppError("bench-order-mismatch", "List every bench of the zone in use, each once", 400, [{ path: "benchIds", message: `Expected the benches ${[...liveIds].join(", ")}` }]);
    }
    const names = (ids: number[]) => ids.map((id) => live.find((b) => b.id === id)!.name).join(", ");
    const beforeIds = live.map((b) => b.id);
    const unchanged = benchIds.every((id, i) => live.find((b) => b.id === id)!.position === i);
    if (!unchanged) {
      await this.dataSource.transaction(async (tx) => {
        for (const [position, id] of benchIds.entries()) await tx.getRepository(BenchEntity).update({ id }, { position });
        await writeAuditEntry(
          tx,
          { entityType: "zone", entityId: zoneId, action: "reordered", subject: zone.name, siteId: zone.siteId, zoneId, changes: [auditChange("benchOrder", "text", names(beforeIds), names(benchIds))] },
          this.now(),
          actor,
        );
      });
    }
    return this.views([], [], await this.dataSource.getRepository(BenchEntity).find({ where: { zoneId, archivedAtMs: IsNull() }, order: { position: "ASC", id: "ASC" } }));
  }
}
