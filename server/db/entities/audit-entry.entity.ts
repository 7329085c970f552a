import { EntitySchema } from "typeorm";
import type { AuditAction, AuditEntityType } from "../../../shared/schemas/audit.js";
import type { Role } from "../../../shared/schemas/auth.js";

/**
 * One audited change (who, when, old → new). No foreign keys: the trail outlives what it
 * describes, and names are copied in as they were at the time.
 */
export interface AuditEntryRecord {
  id: number;
  atMs: number;
  actorUserId: number | null;
  actorName: string;
  actorRole: Role | null;
  entityType: AuditEntityType;
  entityId: string;
  action: AuditAction;
  subject: string;
  siteId: number | null;
  zoneId: number | null;
  previousZoneId: number | null;
  benchId: number | null;
  /** JSON array of AuditChange (shared/schemas/audit.ts). */
  changes: string;
  note: string | null;
}

export const AuditEntryEntity = new EntitySchema<AuditEntryRecord>({
  name: "AuditEntry",
  tableName: "audit_entry",
  columns: {
    id: { type: "integer", primary: true, generated: "increment" },
    atMs: { type: "integer", name: "at_ms" },
    actorUserId: { type: "integer", name: "actor_user_id", nullable: true },
    actorName: { type: "varchar", name: "actor_name", length: 80 },
    actorRole: { type: "varchar", name: "actor_role", length: 16, nullable: true },
    entityType: { type: "varchar", name: "entity_type", length: 32 },
    entityId: { type: "varchar", name: "entity_id", length: 64 },
    action: { type: "varchar", length: 32 },
    subject: { type: "varchar", length: 300 },
    siteId: { type: "integer", name: "site_id", nullable: true },
    zoneId: { type: "integer", name: "zone_id", nullable: true },
    previousZoneId: { type: "integer", name: "previous_zone_id", nullable: true },
    benchId: { type: "integer", name: "bench_id", nullable: true },
    changes: { type: "text" },
    note: { type: "text", nullable: true },
  },
  indices: [
    { name: "idx_audit_entry_zone", columns: ["zoneId", "id"] },
    { name: "idx_audit_entry_previous_zone", columns: ["previousZoneId", "id"] },
    { name: "idx_audit_entry_bench", columns: ["benchId", "id"] },
  ],
});
