import { EntitySchema } from "typeorm";

export interface Site {
  id: number;
  name: string;
  /** IANA time zone of the greenhouse, for "night" and day boundaries. */
  timeZone: string;
  createdAtMs: number;
  /** When it was archived (hidden, history kept); null while in use. */
  archivedAtMs: number | null;
  /** Unacknowledged this long (s) → the managers are mailed; null = the server's ALERT_ESCALATE_AFTER. */
  escalateAfterS: number | null;
  /** While unacknowledged, the person on duty is reminded this often (s); null = ALERT_RENOTIFY_EVERY. */
  renotifyEveryS: number | null;
}

// EntitySchema rather than decorators: tsx, vitest and tsc then agree without decorator metadata.
export const SiteEntity = new EntitySchema<Site>({
  name: "Site",
  tableName: "site",
  columns: {
    id: { type: "integer", primary: true, generated: "increment" },
    name: { type: "varchar", length: 120 },
    timeZone: { type: "varchar", name: "time_zone", length: 64, default: "UTC" },
    createdAtMs: { type: "integer", name: "created_at_ms" },
    archivedAtMs: { type: "integer", name: "archived_at_ms", nullable: true },
    escalateAfterS: { type: "integer", name: "escalate_after_s", nullable: true },
    renotifyEveryS: { type: "integer", name: "renotify_every_s", nullable: true },
  },
});
