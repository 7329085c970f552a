import { In, IsNull, Not, type DataSource, type EntityManager } from "typeorm";
import { BUILT_IN_PRESETS, windowWarnings } from "../../../shared/domain/window-guidance.js";
import type { AuditChange, AuditValueKind } from "../../../shared/schemas/audit.js";
import { WINDOWED_QUANTITIES, type WindowedQuantity } from "../../../shared/schemas/quantities.js";
import type {
  ApplyBenchPresetInput,
  ApplyZonePresetInput,
  BenchWindowsInput,
  BenchWindowsResponse,
  BenchWindowsSaveResponse,
  EffectiveWindow,
  QuantityWindow,
  UpdateWindowPresetInput,
  WindowLimitField,
  WindowPreset,
  WindowPresetInput,
  WindowPresetResponse,
  ZoneWindowsInput,
  ZoneWindowsResponse,
  ZoneWindowsSaveResponse,
} from "../../../shared/schemas/windows.js";
import { BenchEntity, type Bench } from "../../db/entities/bench.entity.js";
import { SiteEntity, type Site } from "../../db/entities/site.entity.js";
import { BenchWindowEntity, ZoneWindowEntity } from "../../db/entities/window.entity.js";
import { WindowPresetEntity, type WindowPresetRecord } from "../../db/entities/window-preset.entity.js";
import { ZoneEntity, type Zone } from "../../db/entities/zone.entity.js";
import type { Principal } from "../../lib/auth.js";
import { AppError, notFound } from "../../lib/errors.js";
import { auditChange, writeAuditEntry, type AuditInput } from "../audit/audit.service.js";
import { sortWindows, toQuantityWindow, toWindowLimit, type WindowsService } from "./windows.service.js";

/** A zone's (or a bench's effective) window set, stored units. */
export interface WindowSet {
  windows: QuantityWindow[];
  dewPointMarginC: number;
}

/** A bench's overrides: margin null follows the zone. */
export interface OverrideSet {
  windows: QuantityWindow[];
  dewPointMarginC: number | null;
}

const LIMIT_FIELDS: readonly WindowLimitField[] = ["min", "max", "delayS", "hysteresis"];

/** How an audited window field's values are read (shared/schemas/audit.ts). */
export function windowFieldKind(quantity: WindowedQuantity, field: WindowLimitField): AuditValueKind {
  if (field === "delayS") return "duration";
  if (quantity === "air.humidity") return "humidity";
  if (quantity === "medium.moisture") return "moisture";
  return field === "hysteresis" ? "temperature-difference" : "temperature";
}

/** Field-by-field differences between two window sets (a window added: old null; removed: new null). */
export function windowSetChanges(
  before: { windows: readonly QuantityWindow[]; dewPointMarginC: number | null },
  after: { windows: readonly QuantityWindow[]; dewPointMarginC: number | null },
): AuditChange[] {
  const oldBy = new Map(before.windows.map((w) => [w.quantity, w]));
  const newBy = new Map(after.windows.map((w) => [w.quantity, w]));
  const out: AuditChange[] = [];
  for (const quantity of WINDOWED_QUANTITIES) {
    const o = oldBy.get(quantity);
    const n = newBy.get(quantity);
    for (const field of LIMIT_FIELDS) {
      const ov = o?.[field] ?? null;
      const nv = n?.[field] ?? null;
      if (ov !== nv) out.push(auditChange(field, windowFieldKind(quantity, field), ov, nv, { quantity }));
    }
  }
  if (before.dewPointMarginC !== after.dewPointMarginC) {
    out.push(auditChange("dewPointMarginC", "temperature-difference", before.dewPointMarginC, after.dewPointMarginC));
  }
  return out;
}

/** Replace a zone's windows and margin (inside the caller's transaction). */
export async function writeZoneWindows(manager: EntityManager, zoneId: number, set: WindowSet): Promise<void> {
  await manager.getRepository(ZoneWindowEntity).delete({ zoneId });
  if (set.windows.length > 0) await manager.getRepository(ZoneWindowEntity).insert(set.windows.map((w) => ({ zoneId, ...toWindowLimit(w) })));
  await manager.getRepository(ZoneEntity).update({ id: zoneId }, { dewPointMarginC: set.dewPointMarginC });
}

async function writeBenchOverrides(manager: EntityManager, benchId: number, set: OverrideSet): Promise<void> {
  await manager.getRepository(BenchWindowEntity).delete({ benchId });
  if (set.windows.length > 0) await manager.getRepository(BenchWindowEntity).insert(set.windows.map((w) => ({ benchId, ...toWindowLimit(w) })));
  await manager.getRepository(BenchEntity).update({ id: benchId }, { dewPointMarginC: set.dewPointMarginC });
}

export function zoneSubject(zone: Pick<Zone, "name">): string {
  return zone.name;
}

export function benchSubject(zone: Pick<Zone, "name"> | null, bench: Pick<Bench, "name">): string {
  return zone ? `${zone.name} › ${bench.name}` : bench.name;
}

/** The window in force per quantity on a bench, with where it comes from and what differs from the zone. */
export function effectiveWindows(zone: readonly QuantityWindow[], overrides: readonly QuantityWindow[]): EffectiveWindow[] {
  const zoneBy = new Map(zone.map((w) => [w.quantity, w]));
  const benchBy = new Map(overrides.map((w) => [w.quantity, w]));
  return WINDOWED_QUANTITIES.map((quantity) => {
    const zw = zoneBy.get(quantity) ?? null;
    const bw = benchBy.get(quantity) ?? null;
    return {
      quantity,
      window: bw ?? zw,
      source: bw ? "bench" : zw ? "zone" : "none",
      zoneWindow: zw,
      differingFields: bw ? LIMIT_FIELDS.filter((f) => !zw || zw[f] !== bw[f]) : [],
    };
  });
}

function presetView(r: WindowPresetRecord): WindowPreset {
  return {
    id: String(r.id),
    name: r.name,
    description: r.description,
    builtIn: false,
    windows: sortWindows(JSON.parse(r.windows) as QuantityWindow[]),
    dewPointMarginC: r.dewPointMarginC,
    notes: [],
    createdAtMs: r.createdAtMs,
    updatedAtMs: r.updatedAtMs,
  };
}

/**
 * Managers' window settings: zone windows, bench overrides, dew-point margins and presets. Every
 * save is validated (by the shared schema, in the route), answered with guidance warnings, audited
 * in the same transaction, and followed by WindowsService.reload() so the next evaluation uses it.
 */
export class WindowSettingsService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly windows: WindowsService,
    private readonly now: () => number = Date.now,
  ) {}

  // ── reading ───────────────────────────────────────────────────────────────

  private async zoneWithSite(zoneId: number): Promise<{ zone: Zone; site: Site | null }> {
    const zone = await this.dataSource.getRepository(ZoneEntity).findOneBy({ id: zoneId });
    if (!zone) throw notFound("zone-not-found", `There is no zone ${zoneId}`);
    const site = await this.dataSource.getRepository(SiteEntity).findOneBy({ id: zone.siteId });
    return { zone, site };
  }

  private async benchWithZone(benchId: number): Promise<{ bench: Bench; zone: Zone }> {
    const bench = await this.dataSource.getRepository(BenchEntity).findOneBy({ id: benchId });
    if (!bench) throw notFound("bench-not-found", `There is no bench ${benchId}`);
    const zone = await this.dataSource.getRepository(ZoneEntity).findOneByOrFail({ id: bench.zoneId });
    return { bench, zone };
  }

  private async zoneSet(manager: EntityManager, zone: Zone): Promise<WindowSet> {
    const rows = await manager.getRepository(ZoneWindowEntity).findBy({ zoneId: zone.id });
    return { windows: sortWindows(rows.map(toQuantityWindow)), dewPointMarginC: zone.dewPointMarginC };
  }

  private async overrideSet(manager: EntityManager, bench: Bench): Promise<OverrideSet> {
    const rows = await manager.getRepository(BenchWindowEntity).findBy({ benchId: bench.id });
    return { windows: sortWindows(rows.map(toQuantityWindow)), dewPointMarginC: bench.dewPointMarginC };
  }

  private async benchOverrideSummaries(zoneId: number): Promise<ZoneWindowsResponse["benchOverrides"]> {
    const benches = await this.dataSource.getRepository(BenchEntity).find({ where: { zoneId, archivedAtMs: IsNull() }, order: { position: "ASC", id: "ASC" } });
    if (benches.length === 0) return [];
    const rows = await this.dataSource.getRepository(BenchWindowEntity).findBy({ benchId: In(benches.map((b) => b.id)) });
    return benches.flatMap((b) => {
      const quantities = WINDOWED_QUANTITIES.filter((q) => rows.some((r) => r.benchId === b.id && r.quantity === q));
      return quantities.length > 0 || b.dewPointMarginC !== null ? [{ benchId: b.id, benchName: b.name, quantities, dewPointMarginC: b.dewPointMarginC }] : [];
    });
  }

  private async zoneResponse(zone: Zone, site: Site | null, set: WindowSet, clearedOverrides = false): Promise<ZoneWindowsResponse> {
    return {
      zone: { id: zone.id, name: zone.name, siteId: zone.siteId, siteName: site?.name ?? "", archived: zone.archivedAtMs !== null },
      windows: sortWindows(set.windows),
      dewPointMarginC: set.dewPointMarginC,
      warnings: windowWarnings(set),
      benchOverrides: clearedOverrides ? [] : await this.benchOverrideSummaries(zone.id),
    };
  }

  private benchResponse(bench: Bench, zone: Zone, zoneSet: WindowSet, overrides: OverrideSet): BenchWindowsResponse {
    const effective = effectiveWindows(zoneSet.windows, overrides.windows);
    const marginC = overrides.dewPointMarginC ?? zoneSet.dewPointMarginC;
    return {
      bench: { id: bench.id, name: bench.name, zoneId: zone.id, zoneName: zone.name, archived: bench.archivedAtMs !== null },
      zone: { windows: zoneSet.windows, dewPointMarginC: zoneSet.dewPointMarginC },
      overrides: { windows: sortWindows(overrides.windows), dewPointMarginC: overrides.dewPointMarginC },
      effective,
      dewPointMargin: {
        valueC: marginC,
        source: overrides.dewPointMarginC === null ? "zone" : "bench",
        differsFromZone: overrides.dewPointMarginC !== null && overrides.dewPointMarginC !== zoneSet.dewPointMarginC,
      },
      warnings: windowWarnings({ windows: effective.flatMap((e) => (e.window ? [e.window] : [])), dewPointMarginC: marginC }),
    };
  }

  async zoneWindows(zoneId: number): Promise<ZoneWindowsResponse> {
    const { zone, site } = await this.zoneWithSite(zoneId);
    return this.zoneResponse(zone, site, await this.zoneSet(this.dataSource.manager, zone));
  }

  async benchWindows(benchId: number): Promise<BenchWindowsResponse> {
    const { bench, zone } = await this.benchWithZone(benchId);
    return this.benchResponse(bench, zone, await this.zoneSet(this.dataSource.manager, zone), await this.overrideSet(this.dataSource.manager, bench));
  }

  // ── saving ────────────────────────────────────────────────────────────────

  async saveZoneWindows(
    zoneId: number,
    input: ZoneWindowsInput,
    actor: Principal,
    options: { dryRun: boolean; presetName?: string; clearBenchOverrides?: boolean },
  ): Promise<ZoneWindowsSaveResponse> {
    const { zone, site } = await this.zoneWithSite(zoneId);
    if (zone.archivedAtMs !== null) throw new AppError("zone-archived", `${zone.name} is archived; restore it to change its windows`, 409);
    const next: WindowSet = { windows: sortWindows(input.windows), dewPointMarginC: input.dewPointMarginC };
    const before = await this.zoneSet(this.dataSource.manager, zone);
    const changes = windowSetChanges(before, next);
    const clearing = options.clearBenchOverrides ? await this.benchOverrideSummaries(zone.id) : [];
    const changed = changes.length > 0 || clearing.length > 0;
    if (options.dryRun || !changed) {
      return { ...(await this.zoneResponse(zone, site, next, options.dryRun && clearing.length > 0)), dryRun: options.dryRun, changed };
    }

    const atMs = this.now();
    await this.dataSource.transaction(async (tx) => {
      await writeZoneWindows(tx, zone.id, next);
      const entry: AuditInput = {
        entityType: "zone-windows",
        entityId: zone.id,
        action: options.presetName ? "preset-applied" : "updated",
        subject: zoneSubject(zone),
        siteId: zone.siteId,
        zoneId: zone.id,
        changes,
        note: options.presetName ? `Preset “${options.presetName}” applied` : null,
      };
      if (changes.length > 0 || options.presetName) await writeAuditEntry(tx, entry, atMs, actor);
      for (const summary of clearing) {
        const bench = await tx.getRepository(BenchEntity).findOneByOrFail({ id: summary.benchId });
        const overrides = await this.overrideSet(tx, bench);
        await writeBenchOverrides(tx, bench.id, { windows: [], dewPointMarginC: null });
        await writeAuditEntry(
          tx,
          {
            entityType: "bench-windows",
            entityId: bench.id,
            action: "updated",
            subject: benchSubject(zone, bench),
            siteId: zone.siteId,
            zoneId: zone.id,
            benchId: bench.id,
            changes: windowSetChanges(overrides, { windows: [], dewPointMarginC: null }),
            note: `Overrides removed when preset “${options.presetName ?? ""}” was applied to the zone`,
          },
          atMs,
          actor,
        );
      }
    });
    await this.windows.reload();
    const saved = await this.zoneWithSite(zoneId);
    return { ...(await this.zoneResponse(saved.zone, saved.site, await this.zoneSet(this.dataSource.manager, saved.zone))), dryRun: false, changed: true };
  }

  async saveBenchWindows(benchId: number, input: BenchWindowsInput, actor: Principal, options: { dryRun: boolean; presetName?: string }): Promise<BenchWindowsSaveResponse> {
    const { bench, zone } = await this.benchWithZone(benchId);
    if (bench.archivedAtMs !== null) throw new AppError("bench-archived", `${bench.name} is archived; restore it to change its windows`, 409);
    const zoneSet = await this.zoneSet(this.dataSource.manager, zone);
    const before = await this.overrideSet(this.dataSource.manager, bench);
    const next: OverrideSet = { windows: sortWindows(input.windows), dewPointMarginC: input.dewPointMarginC };
    const changes = windowSetChanges(before, next);
    const changed = changes.length > 0;
    if (options.dryRun || !changed) {
      return { ...this.benchResponse(bench, zone, zoneSet, next), dryRun: options.dryRun, changed };
    }
    await this.dataSource.transaction(async (tx) => {
      await writeBenchOverrides(tx, bench.id, next);
      await writeAuditEntry(
        tx,
        {
          entityType: "bench-windows",
          entityId: bench.id,
          action: options.presetName ? "preset-applied" : "updated",
          subject: benchSubject(zone, bench),
          siteId: zone.siteId,
          zoneId: zone.id,
          benchId: bench.id,
          changes,
          note: options.presetName ? `Preset “${options.presetName}” applied as the bench's overrides` : null,
        },
        this.now(),
        actor,
      );
    });
    await this.windows.reload();
    const saved = await this.benchWithZone(benchId);
    return { ...this.benchResponse(saved.bench, saved.zone, zoneSet, await this.overrideSet(this.dataSource.manager, saved.bench)), dryRun: false, changed: true };
  }

  // ── presets ───────────────────────────────────────────────────────────────

  async listPresets(): Promise<WindowPreset[]> {
    const custom = await this.dataSource.getRepository(WindowPresetEntity).find({ order: { name: "ASC", id: "ASC" } });
    return [...BUILT_IN_PRESETS.map((p) => structuredClone(p)), ...custom.map(presetView)];
  }

  async findPreset(id: string): Promise<WindowPreset> {
    const builtIn = BUILT_IN_PRESETS.find((p) => p.id === id);
    if (builtIn) return structuredClone(builtIn);
    const record = /^\d{1,12}$/.test(id) ? await this.dataSource.getRepository(WindowPresetEntity).findOneBy({ id: Number(id) }) : null;
    if (!record) throw notFound("preset-not-found", `There is no preset ${id}`);
    return presetView(record);
  }

  private async customPreset(id: string): Promise<WindowPresetRecord> {
    if (BUILT_IN_PRESETS.some((p) => p.id === id)) {
      throw new AppError("preset-built-in", "Built-in presets cannot be changed; save a copy under a new name instead", 409);
    }
    const record = /^\d{1,12}$/.test(id) ? await this.dataSource.getRepository(WindowPresetEntity).findOneBy({ id: Number(id) }) : null;
    if (!record) throw notFound("preset-not-found", `There is no preset ${id}`);
    return record;
  }

  private async assertNameFree(name: string, exceptId?: number): Promise<void> {
    const lower = name.toLowerCase();
    const custom = await this.dataSource.getRepository(WindowPresetEntity).find();
    if (BUILT_IN_PRESETS.some((p) => p.name.toLowerCase() === lower) || custom.some((p) => p.id !== exceptId && p.name.toLowerCase() === lower)) {
      throw new AppError("preset-name-taken", `A preset called ${name} already exists`, 409, [{ path: "name", message: "This name is taken" }]);
    }
  }

  async createPreset(input: WindowPresetInput, actor: Principal, options: { dryRun: boolean }): Promise<WindowPresetResponse> {
    await this.assertNameFree(input.name);
    const atMs = this.now();
    const windows = sortWindows(input.windows);
    if (options.dryRun) {
      const draft: WindowPresetResponse["preset"] = {
        id: null,
        name: input.name,
        description: input.description,
        builtIn: false,
        windows,
        dewPointMarginC: input.dewPointMarginC,
        notes: [],
        createdAtMs: null,
        updatedAtMs: null,
      };
      return { preset: draft, warnings: windowWarnings(draft), dryRun: true, changed: true };
    }
    const id = await this.dataSource.transaction(async (tx) => {
      const result = await tx.getRepository(WindowPresetEntity).insert({
        name: input.name,
        description: input.description,
        windows: JSON.stringify(windows),
        dewPointMarginC: input.dewPointMarginC,
        createdAtMs: atMs,
        updatedAtMs: atMs,
      });
      const newId = result.identifiers[0]!.id as number;
      await writeAuditEntry(
        tx,
        {
          entityType: "window-preset",
          entityId: newId,
          action: "created",
          subject: input.name,
          changes: [
            auditChange("name", "text", null, input.name),
            ...windowSetChanges({ windows: [], dewPointMarginC: null }, { windows, dewPointMarginC: input.dewPointMarginC }),
          ],
        },
        atMs,
        actor,
      );
      return newId;
    });
    const preset = await this.findPreset(String(id));
    return { preset, warnings: windowWarnings(preset), dryRun: false, changed: true };
  }

  async updatePreset(id: string, input: UpdateWindowPresetInput, actor: Principal, options: { dryRun: boolean }): Promise<WindowPresetResponse> {
    const record = await this.customPreset(id);
    if (input.name !== undefined) await this.assertNameFree(input.name, record.id);
    const before = presetView(record);
    const after: WindowPreset = {
      ...before,
      name: input.name ?? before.name,
      description: input.description ?? before.description,
      windows: input.windows ? sortWindows(input.windows) : before.windows,
      dewPointMarginC: input.dewPointMarginC ?? before.dewPointMarginC,
    };
    const changes = [
      ...(before.name !== after.name ? [auditChange("name", "text", before.name, after.name)] : []),
      ...(before.description !== after.description ? [auditChange("description", "text", before.description, after.description)] : []),
      ...windowSetChanges(before, after),
    ];
    const changed = changes.length > 0;
    if (options.dryRun) return { preset: after, warnings: windowWarnings(after), dryRun: true, changed };
    if (changed) {
      const atMs = this.now();
      await this.dataSource.transaction(async (tx) => {
        await tx.getRepository(WindowPresetEntity).update(
          { id: record.id },
          { name: after.name, description: after.description, windows: JSON.stringify(after.windows), dewPointMarginC: after.dewPointMarginC, updatedAtMs: atMs },
        );
        await writeAuditEntry(tx, { entityType: "window-preset", entityId: record.id, action: "updated", subject: after.name, changes }, atMs, actor);
      });
    }
    const preset = await this.findPreset(id);
    return { preset, warnings: windowWarnings(preset), dryRun: false, changed };
  }

  /** Deletes a custom preset; zones that used it keep their windows (a preset is copied when applied). */
  async deletePreset(id: string, actor: Principal): Promise<void> {
    const record = await this.customPreset(id);
    const before = presetView(record);
    await this.dataSource.transaction(async (tx) => {
      await tx.getRepository(WindowPresetEntity).delete({ id: record.id });
      await writeAuditEntry(
        tx,
        {
          entityType: "window-preset",
          entityId: record.id,
          action: "deleted",
          subject: before.name,
          changes: [auditChange("name", "text", before.name, null), ...windowSetChanges(before, { windows: [], dewPointMarginC: null })],
        },
        this.now(),
        actor,
      );
    });
  }

  async applyPresetToZone(zoneId: number, input: ApplyZonePresetInput, actor: Principal, options: { dryRun: boolean }): Promise<ZoneWindowsSaveResponse> {
    const preset = await this.findPreset(input.presetId);
    return this.saveZoneWindows(zoneId, { windows: preset.windows, dewPointMarginC: preset.dewPointMarginC }, actor, {
      dryRun: options.dryRun,
      presetName: preset.name,
      clearBenchOverrides: input.clearBenchOverrides,
    });
  }

  async applyPresetToBench(benchId: number, input: ApplyBenchPresetInput, actor: Principal, options: { dryRun: boolean }): Promise<BenchWindowsSaveResponse> {
    const preset = await this.findPreset(input.presetId);
    return this.saveBenchWindows(benchId, { windows: preset.windows, dewPointMarginC: preset.dewPointMarginC }, actor, { dryRun: options.dryRun, presetName: preset.name });
  }

  /** Benches (by id) that override anything: for the layout view. */
  async benchesWithOverrides(): Promise<Set<number>> {
    const [rows, benches] = await Promise.all([
      this.dataSource.getRepository(BenchWindowEntity).find({ select: { benchId: true } }),
      this.dataSource.getRepository(BenchEntity).find({ where: { dewPointMarginC: Not(IsNull()) }, select: { id: true } }),
    ]);
    return new Set([...rows.map((r) => r.benchId), ...benches.map((b) => b.id)]);
  }
}
