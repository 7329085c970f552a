import { In, IsNull, type DataSource, type EntityManager } from "typeorm";
import { describeDurationS } from "../../../shared/domain/duration.js";
import { clockTime, describeWeekdays, usersOnDuty } from "../../../shared/domain/duty-rota.js";
import type { AuditChange } from "../../../shared/schemas/audit.js";
import type { DutyRotaResponse, DutyShift, DutyShiftInput, SiteAlertTiming, SiteAlertTimingInput } from "../../../shared/schemas/alerts.js";
import { DutyShiftEntity, type DutyShiftRecord } from "../../db/entities/alert.entity.js";
import { SiteEntity, type Site } from "../../db/entities/site.entity.js";
import { UserEntity } from "../../db/entities/user.entity.js";
import { ZoneEntity } from "../../db/entities/zone.entity.js";
import type { Principal } from "../../lib/auth.js";
import { AppError, notFound } from "../../lib/errors.js";
import { auditChange, writeAuditEntry } from "../audit/audit.service.js";

/** The server's alert timing (ALERT_ESCALATE_AFTER, ALERT_RENOTIFY_EVERY), used where a site sets none. */
export interface AlertTimingDefaults {
  escalateAfterMs: number;
  renotifyEveryMs: number;
}

const EVERY_ZONE = "Every zone";

/** A shift's fields as the audit trail records them, each with a label that reads without the rota page. */
interface ShiftWords {
  record: Omit<DutyShiftRecord, "id">;
  userName: string;
  /** null: every zone. */
  zoneName: string | null;
  siteId: number | null;
}

/** The changed fields of a shift, old → new (before null: created; after null: deleted). */
function shiftChanges(before: ShiftWords | null, after: ShiftWords | null): AuditChange[] {
  const changes: AuditChange[] = [];
  const add = (field: string, kind: AuditChange["kind"], pick: (s: ShiftWords) => { value: number | boolean | null; label: string | null }) => {
    const old = before ? pick(before) : null;
    const now = after ? pick(after) : null;
    if (old && now && old.value === now.value) return;
    changes.push(auditChange(field, kind, old?.value ?? null, now?.value ?? null, { oldLabel: old?.label ?? null, newLabel: now?.label ?? null }));
  };
  add("userId", "reference", (s) => ({ value: s.record.userId, label: s.userName }));
  add("zoneId", "reference", (s) => ({ value: s.record.zoneId, label: s.zoneName ?? EVERY_ZONE }));
  add("weekdays", "number", (s) => ({ value: s.record.weekdays, label: describeWeekdays(s.record.weekdays) }));
  add("startMinute", "number", (s) => ({ value: s.record.startMinute, label: clockTime(s.record.startMinute) }));
  add("endMinute", "number", (s) => ({ value: s.record.endMinute, label: clockTime(s.record.endMinute) }));
  add("isFallback", "boolean", (s) => ({ value: s.record.isFallback, label: null }));
  return changes;
}

/** "Marisol Ortega · Every zone", "Marisol Ortega · House 1 · Fig cuttings". */
function shiftSubject(words: ShiftWords): string {
  return `${words.userName} · ${words.zoneName ?? EVERY_ZONE}`;
}

/**
 * The duty rota: who is mailed about which zone, when; and per site, when nobody acknowledges,
 * how soon the managers are told and how often the person on duty is reminded. Every change is
 * audited in the transaction that makes it.
 */
export class RotaService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly defaults: AlertTimingDefaults,
    private readonly now: () => number = Date.now,
  ) {}

  private async assertRefs(input: DutyShiftInput): Promise<Omit<ShiftWords, "record">> {
    const user = await this.dataSource.getRepository(UserEntity).findOneBy({ id: input.userId });
    if (!user || user.disabled) throw new AppError("user-not-found", "Choose an active user", 400, [{ path: "userId", message: "Choose an active user" }]);
    if (user.role === "viewer") throw new AppError("viewer-cannot-be-on-duty", "A viewer cannot acknowledge, so cannot be on duty", 400, [{ path: "userId", message: "Viewers cannot acknowledge alerts" }]);
    const zone = input.zoneId === null ? null : await this.dataSource.getRepository(ZoneEntity).findOneBy({ id: input.zoneId });
    if (input.zoneId !== null && !zone) {
      throw new AppError("zone-not-found", "Choose an existing zone", 400, [{ path: "zoneId", message: "Choose an existing zone" }]);
    }
    return { userName: user.name, zoneName: zone?.name ?? null, siteId: zone?.siteId ?? null };
  }

  /** A stored shift with the names the audit trail needs (a person or zone gone since reads as its id). */
  private async words(tx: EntityManager, shift: DutyShiftRecord): Promise<ShiftWords> {
    const user = await tx.getRepository(UserEntity).findOneBy({ id: shift.userId });
    const zone = shift.zoneId === null ? null : await tx.getRepository(ZoneEntity).findOneBy({ id: shift.zoneId });
    const { id: _id, ...record } = shift;
    return {
      record,
      userName: user?.name ?? `User ${shift.userId}`,
      zoneName: shift.zoneId === null ? null : (zone?.name ?? `Zone ${shift.zoneId}`),
      siteId: zone?.siteId ?? null,
    };
  }

  private async views(rows: DutyShiftRecord[]): Promise<DutyShift[]> {
    const users = await this.dataSource.getRepository(UserEntity).find();
    const zones = await this.dataSource.getRepository(ZoneEntity).find();
    return rows.map((s) => ({
      ...s,
      zoneName: s.zoneId === null ? null : (zones.find((z) => z.id === s.zoneId)?.name ?? null),
      userName: users.find((u) => u.id === s.userId)?.name ?? "",
    }));
  }

  async rota(): Promise<DutyRotaResponse> {
    const shifts = await this.dataSource.getRepository(DutyShiftEntity).find({ order: { isFallback: "ASC", startMinute: "ASC", id: "ASC" } });
    const zones = await this.dataSource.getRepository(ZoneEntity).find({ where: { archivedAtMs: IsNull() }, order: { position: "ASC", id: "ASC" } });
    const sites = await this.dataSource.getRepository(SiteEntity).find({ order: { id: "ASC" } });
    const timeZone = sites[0]?.timeZone ?? "UTC";
    const users = await this.dataSource.getRepository(UserEntity).find({ where: { disabled: false }, order: { id: "ASC" } });
    const managers = users.filter((u) => u.role === "manager");
    const onDutyNow = zones.map((zone) => {
      const ids = usersOnDuty(shifts, zone.id, this.now(), timeZone);
      const chosen = ids.length ? users.filter((u) => ids.includes(u.id)) : managers;
      return { zoneId: zone.id, zoneName: zone.name, users: chosen.map((u) => ({ id: u.id, name: u.name })) };
    });
    const alertTiming = sites.filter((s) => s.archivedAtMs === null).map((s) => this.timingView(s));
    return { shifts: await this.views(shifts), onDutyNow, timeZone, alertTiming };
  }

  /** Active users who can acknowledge, for the rota's person picker (managers cannot list users). */
  async candidates(): Promise<{ id: number; name: string; role: "admin" | "manager" | "grower" }[]> {
    const users = await this.dataSource.getRepository(UserEntity).find({ where: { disabled: false }, order: { name: "ASC" } });
    return users.flatMap((u) => (u.role === "viewer" ? [] : [{ id: u.id, name: u.name, role: u.role }]));
  }

  async create(input: DutyShiftInput, actor: Principal): Promise<DutyShift> {
    const refs = await this.assertRefs(input);
    const atMs = this.now();
    const saved = await this.dataSource.transaction(async (tx) => {
      const row = await tx.getRepository(DutyShiftEntity).save({ ...input });
      const after: ShiftWords = { record: { ...input }, ...refs };
      await writeAuditEntry(
        tx,
        { entityType: "duty-rota", entityId: row.id, action: "created", subject: shiftSubject(after), siteId: refs.siteId, zoneId: input.zoneId, changes: shiftChanges(null, after) },
        atMs,
        actor,
      );
      return row;
    });
    return (await this.views([saved]))[0]!;
  }

  async replace(id: number, input: DutyShiftInput, actor: Principal): Promise<DutyShift> {
    if (!(await this.dataSource.getRepository(DutyShiftEntity).existsBy({ id }))) throw notFound("shift-not-found", `There is no shift ${id}`);
    const refs = await this.assertRefs(input);
    const atMs = this.now();
    await this.dataSource.transaction(async (tx) => {
      const row = await tx.getRepository(DutyShiftEntity).findOneBy({ id });
      if (!row) throw notFound("shift-not-found", `There is no shift ${id}`);
      const before = await this.words(tx, row);
      const after: ShiftWords = { record: { ...input }, ...refs };
      const changes = shiftChanges(before, after);
      if (changes.length === 0) return;
      await tx.getRepository(DutyShiftEntity).update({ id }, input);
      const movedZone = before.record.zoneId !== input.zoneId;
      await writeAuditEntry(
        tx,
        {
          entityType: "duty-rota",
          entityId: id,
          action: "updated",
          subject: shiftSubject(after),
          siteId: refs.siteId,
          zoneId: input.zoneId,
          previousZoneId: movedZone ? before.record.zoneId : null,
          changes,
        },
        atMs,
        actor,
      );
    });
    return (await this.views(await this.dataSource.getRepository(DutyShiftEntity).find({ where: { id: In([id]) } })))[0]!;
  }

  async remove(id: number, actor: Principal): Promise<void> {
    const atMs = this.now();
    await this.dataSource.transaction(async (tx) => {
      const row = await tx.getRepository(DutyShiftEntity).findOneBy({ id });
      if (!row) throw notFound("shift-not-found", `There is no shift ${id}`);
      const before = await this.words(tx, row);
      await tx.getRepository(DutyShiftEntity).delete({ id });
      await writeAuditEntry(
        tx,
        {
          entityType: "duty-rota",
          entityId: id,
          action: "deleted",
          subject: shiftSubject(before),
          siteId: before.siteId,
          zoneId: row.zoneId,
          changes: shiftChanges(before, null),
        },
        atMs,
        actor,
      );
    });
  }

  // ── alert timing per site ─────────────────────────────────────────────────

  private timingView(site: Site): SiteAlertTiming {
    return {
      siteId: site.id,
      siteName: site.name,
      escalateAfterS: site.escalateAfterS,
      renotifyEveryS: site.renotifyEveryS,
      defaultEscalateAfterS: Math.round(this.defaults.escalateAfterMs / 1000),
      defaultRenotifyEveryS: Math.round(this.defaults.renotifyEveryMs / 1000),
    };
  }

  /** Sets a site's escalation and reminder times (null = the server's default); the engine uses them at its next pass. */
  async setAlertTiming(siteId: number, input: SiteAlertTimingInput, actor: Principal): Promise<SiteAlertTiming> {
    const atMs = this.now();
    const site = await this.dataSource.transaction(async (tx) => {
      const before = await tx.getRepository(SiteEntity).findOneBy({ id: siteId });
      if (!before) throw notFound("site-not-found", `There is no site ${siteId}`);
      if (before.archivedAtMs !== null) throw new AppError("site-archived", `${before.name} is archived`, 409);
      const view = this.timingView(before);
      // Each side named in words, the default with its value then (the server's default may change later).
      const label = (seconds: number | null, defaultS: number) => (seconds === null ? `${describeDurationS(defaultS)} (the default)` : describeDurationS(seconds));
      const changes: AuditChange[] = [];
      for (const [field, defaultS] of [
        ["escalateAfterS", view.defaultEscalateAfterS],
        ["renotifyEveryS", view.defaultRenotifyEveryS],
      ] as const) {
        if (before[field] === input[field]) continue;
        changes.push(auditChange(field, "duration", before[field], input[field], { oldLabel: label(before[field], defaultS), newLabel: label(input[field], defaultS) }));
      }
      if (changes.length === 0) return before;
      await tx.getRepository(SiteEntity).update({ id: siteId }, { escalateAfterS: input.escalateAfterS, renotifyEveryS: input.renotifyEveryS });
      await writeAuditEntry(tx, { entityType: "site", entityId: siteId, action: "updated", subject: before.name, siteId, changes }, atMs, actor);
      return { ...before, ...input };
    });
    return this.timingView(site);
  }
}
