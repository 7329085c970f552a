import { EntitySchema } from "typeorm";

export type AlertKind = "window" | "condensation" | "sensor-silent";
export type AlertPhaseName = "watching" | "raised" | "acknowledged" | "cleared";

/** One incident on one bench: a quantity out of window, condensation risk, or a silent sensor. */
export interface AlertRecord {
  id: number;
  benchId: number;
  zoneId: number;
  kind: AlertKind;
  /** The quantity out of window (kind "window"); null otherwise. */
  quantity: string | null;
  direction: "below" | "above" | null;
  /** The silent sensor (kind "sensor-silent"). */
  sensorId: string | null;
  phase: AlertPhaseName;
  sinceMs: number;
  raisedAtMs: number | null;
  acknowledgedAtMs: number | null;
  acknowledgedByUserId: number | null;
  acknowledgedByName: string | null;
  acknowledgeNote: string | null;
  clearedAtMs: number | null;
  worstValue: number | null;
  lastValue: number | null;
  /** When the last raised/reminder notice for it was queued. */
  lastNotifiedMs: number | null;
  escalatedAtMs: number | null;
  updatedAtMs: number;
}

export const AlertEntity = new EntitySchema<AlertRecord>({
  name: "Alert",
  tableName: "alert",
  columns: {
    id: { type: "integer", primary: true, generated: "increment" },
    benchId: { type: "integer", name: "bench_id" },
    zoneId: { type: "integer", name: "zone_id" },
    kind: { type: "varchar", length: 24 },
    quantity: { type: "varchar", length: 32, nullable: true },
    direction: { type: "varchar", length: 8, nullable: true },
    sensorId: { type: "varchar", name: "sensor_id", length: 64, nullable: true },
    phase: { type: "varchar", length: 16 },
    sinceMs: { type: "integer", name: "since_ms" },
    raisedAtMs: { type: "integer", name: "raised_at_ms", nullable: true },
    acknowledgedAtMs: { type: "integer", name: "acknowledged_at_ms", nullable: true },
    acknowledgedByUserId: { type: "integer", name: "acknowledged_by_user_id", nullable: true },
    acknowledgedByName: { type: "varchar", name: "acknowledged_by_name", length: 80, nullable: true },
    acknowledgeNote: { type: "varchar", name: "acknowledge_note", length: 500, nullable: true },
    clearedAtMs: { type: "integer", name: "cleared_at_ms", nullable: true },
    worstValue: { type: "real", name: "worst_value", nullable: true },
    lastValue: { type: "real", name: "last_value", nullable: true },
    lastNotifiedMs: { type: "integer", name: "last_notified_ms", nullable: true },
    escalatedAtMs: { type: "integer", name: "escalated_at_ms", nullable: true },
    updatedAtMs: { type: "integer", name: "updated_at_ms" },
  },
  indices: [
    { name: "idx_alert_phase", columns: ["phase"] },
    { name: "idx_alert_bench_since", columns: ["benchId", "sinceMs"] },
  ],
});

/**
 * The evaluation state of one thing the engine watches ("window:<bench>:<quantity>",
 * "condensation:<bench>", "silent:<sensor>"), saved at every phase change so a restart resumes it.
 */
export interface AlertTrackerRecord {
  key: string;
  alertId: number | null;
  /** JSON of the shared WindowAlertState (window, condensation) or the silence state. */
  state: string;
}

export const AlertTrackerEntity = new EntitySchema<AlertTrackerRecord>({
  name: "AlertTracker",
  tableName: "alert_tracker",
  columns: {
    key: { type: "varchar", primary: true, length: 120 },
    alertId: { type: "integer", name: "alert_id", nullable: true },
    state: { type: "text" },
  },
});

export type NoticeType = "raised" | "reminder" | "escalation" | "cleared";

/** Something to tell people about an alert, waiting to be grouped with its zone's others into one e-mail. */
export interface AlertNoticeRecord {
  id: number;
  alertId: number;
  zoneId: number;
  type: NoticeType;
  createdAtMs: number;
  /** When it went into the outbox; null while waiting for its group. */
  queuedAtMs: number | null;
}

export const AlertNoticeEntity = new EntitySchema<AlertNoticeRecord>({
  name: "AlertNotice",
  tableName: "alert_notice",
  columns: {
    id: { type: "integer", primary: true, generated: "increment" },
    alertId: { type: "integer", name: "alert_id" },
    zoneId: { type: "integer", name: "zone_id" },
    type: { type: "varchar", length: 16 },
    createdAtMs: { type: "integer", name: "created_at_ms" },
    queuedAtMs: { type: "integer", name: "queued_at_ms", nullable: true },
  },
  indices: [{ name: "idx_alert_notice_waiting", columns: ["queuedAtMs", "zoneId"] }],
});

/** Who is on duty: a user, for a zone (or every zone), on some weekdays, between two times of day. */
export interface DutyShiftRecord {
  id: number;
  /** null = every zone. */
  zoneId: number | null;
  userId: number;
  /** Bit 0 = Sunday … bit 6 = Saturday, in the site's time zone. */
  weekdays: number;
  /** Minutes after local midnight; end before start means the shift runs past midnight. */
  startMinute: number;
  endMinute: number;
  /** A fallback shift is used only when no other shift covers the moment. */
  isFallback: boolean;
}

export const DutyShiftEntity = new EntitySchema<DutyShiftRecord>({
  name: "DutyShift",
  tableName: "duty_shift",
  columns: {
    id: { type: "integer", primary: true, generated: "increment" },
    zoneId: { type: "integer", name: "zone_id", nullable: true },
    userId: { type: "integer", name: "user_id" },
    weekdays: { type: "integer" },
    startMinute: { type: "integer", name: "start_minute" },
    endMinute: { type: "integer", name: "end_minute" },
    isFallback: { type: "boolean", name: "is_fallback", default: false },
  },
});
