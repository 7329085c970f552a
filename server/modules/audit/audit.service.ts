import { LessThan, type DataSource, type EntityManager, type FindOptionsWhere } from "typeorm";
import type {
  AuditAction,
  AuditChange,
  AuditEntityType,
  AuditEntry,
  AuditQuery,
  AuditResponse,
  AuditValue,
  AuditValueKind,
} from "../../../shared/schemas/audit.js";
import type { WindowedQuantity } from "../../../shared/schemas/quantities.js";
import { AuditEntryEntity, type AuditEntryRecord } from "../../db/entities/audit-entry.entity.js";
import { UserEntity } from "../../db/entities/user.entity.js";
import { ZoneEntity } from "../../db/entities/zone.entity.js";
import type { Principal } from "../../lib/auth.js";
import { currentActor } from "./actor-context.js";

/** What a service says about one change; the actor and time are filled in when it is written. */
export interface AuditInput {
  entityType: AuditEntityType;
  entityId: string | number;
  action: AuditAction;
  subject: string;
  siteId?: number | null;
  zoneId?: number | null;
  previousZoneId?: number | null;
  benchId?: number | null;
  changes: AuditChange[];
  note?: string | null;
}

/** The name shown for changes nobody signed in made (start-up bookkeeping). */
export const SYSTEM_ACTOR_NAME = "Benchwarden";

/** One field, old → new. */
export function auditChange(
  field: string,
  kind: AuditValueKind,
  oldValue: AuditValue,
  newValue: AuditValue,
  extra: { quantity?: WindowedQuantity | null; oldLabel?: string | null; newLabel?: string | null } = {},
): AuditChange {
  return { field, quantity: extra.quantity ?? null, kind, old: oldValue, new: newValue, oldLabel: extra.oldLabel ?? null, newLabel: extra.newLabel ?? null };
}

/** The fields of `spec` whose values differ between `before` and `after` (null before: created). */
export function changedFields<T extends object>(before: T | null, after: T, spec: Partial<Record<keyof T & string, AuditValueKind>>): AuditChange[] {
  const out: AuditChange[] = [];
  for (const [field, kind] of Object.entries(spec) as [keyof T & string, AuditValueKind][]) {
    const oldValue = before === null ? null : ((before[field] as AuditValue | undefined) ?? null);
    const newValue = (after[field] as AuditValue | undefined) ?? null;
    if (oldValue !== newValue) out.push(auditChange(field, kind, oldValue, newValue));
  }
  return out;
}

/**
 * Writes one audit entry with `manager` (pass the transaction of the change, so both commit or
 * neither). The actor defaults to the principal of the request being served; none → the system.
 */
export async function writeAuditEntry(manager: EntityManager, input: AuditInput, atMs: number, actor: Principal | null = currentActor()): Promise<void> {
  let actorName = SYSTEM_ACTOR_NAME;
  if (actor) {
    const user = await manager.getRepository(UserEntity).findOneBy({ id: actor.userId });
    actorName = user?.name ?? `User ${actor.userId}`;
  }
  await manager.getRepository(AuditEntryEntity).insert({
    atMs,
    actorUserId: actor?.userId ?? null,
    actorName,
    actorRole: actor?.role ?? null,
    entityType: input.entityType,
    entityId: String(input.entityId),
    action: input.action,
    subject: input.subject.slice(0, 300),
    siteId: input.siteId ?? null,
    zoneId: input.zoneId ?? null,
    previousZoneId: input.previousZoneId ?? null,
    benchId: input.benchId ?? null,
    changes: JSON.stringify(input.changes),
    note: input.note ?? null,
  });
}

function toView(r: AuditEntryRecord): AuditEntry {
  return {
    id: r.id,
    atMs: r.atMs,
    actor: { userId: r.actorUserId, name: r.actorName, role: r.actorRole },
    entityType: r.entityType,
    entityId: r.entityId,
    action: r.action,
    subject: r.subject,
    siteId: r.siteId,
    zoneId: r.zoneId,
    previousZoneId: r.previousZoneId,
    benchId: r.benchId,
    changes: JSON.parse(r.changes) as AuditChange[],
    note: r.note,
  };
}

/**
 * The audit trail: written by every service that changes the layout, windows, presets, sensor
 * assignments or the duty rota (through record() or writeAuditEntry inside its transaction), read
 * per zone or as one list.
 */
export class AuditService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly now: () => number = Date.now,
  ) {}

  /** Record a change; pass `manager` to write inside the change's own transaction. */
  async record(input: AuditInput, options: { actor?: Principal | null; manager?: EntityManager } = {}): Promise<void> {
    await writeAuditEntry(options.manager ?? this.dataSource.manager, input, this.now(), options.actor === undefined ? currentActor() : options.actor);
  }

  async zoneExists(zoneId: number): Promise<boolean> {
    return this.dataSource.getRepository(ZoneEntity).existsBy({ id: zoneId });
  }

  async list(query: AuditQuery): Promise<AuditResponse> {
    const base: FindOptionsWhere<AuditEntryRecord> = {};
    if (query.siteId !== undefined) base.siteId = query.siteId;
    if (query.benchId !== undefined) base.benchId = query.benchId;
    if (query.entityType !== undefined) base.entityType = query.entityType;
    if (query.before !== undefined) base.id = LessThan(query.before);
    // A zone's trail includes what moved out of it.
    const where = query.zoneId !== undefined ? [{ ...base, zoneId: query.zoneId }, { ...base, previousZoneId: query.zoneId }] : base;
    const rows = await this.dataSource.getRepository(AuditEntryEntity).find({ where, order: { id: "DESC" }, take: query.limit + 1 });
    const page = rows.slice(0, query.limit);
    return { entries: page.map(toView), nextBefore: rows.length > query.limit ? (page.at(-1)?.id ?? null) : null };
  }
}
