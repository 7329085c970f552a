import type { DataSource, EntityManager } from "typeorm";
import { dewPointC } from "../../shared/domain/psychrometrics.js";
import {
  acknowledgeAlert,
  evaluateSample,
  evaluateTick,
  initialWindowAlertState,
  type EvaluationWindow,
  type WindowAlertState,
  type WindowTransition,
} from "../../shared/domain/window-evaluation.js";
import { WINDOWED_QUANTITIES } from "../../shared/schemas/quantities.js";
import { AlertEntity, AlertNoticeEntity, AlertTrackerEntity, type AlertKind, type AlertRecord, type NoticeType } from "../db/entities/alert.entity.js";
import { SensorEntity } from "../db/entities/sensor.entity.js";
import { AppError } from "../lib/errors.js";
import type { Logger } from "../lib/logger.js";
import type { Metrics } from "../lib/metrics.js";
import type { ReadingRow } from "../modules/readings/readings.repository.js";
import type { WindowsService } from "../modules/windows/windows.service.js";
import type { LayoutCache } from "./layout-cache.js";

export interface AlertEngineConfig {
  silentAfterMs: number;
  /** The defaults (ALERT_ESCALATE_AFTER, ALERT_RENOTIFY_EVERY); a site's own settings come first. */
  escalateAfterMs: number;
  renotifyEveryMs: number;
}

interface Tracker {
  key: string;
  kind: AlertKind;
  benchId: number;
  quantity: string | null;
  sensorId: string | null;
  state: WindowAlertState;
  alertId: number | null;
}

/** Air readings of one bench, newest of each, for the dew point. */
interface AirPair {
  tempC?: { value: number; timeMs: number };
  rhPct?: { value: number; timeMs: number };
}

const WINDOWED = new Set<string>(WINDOWED_QUANTITIES);
/** Temperature and RH must be this close in time to be combined into a dew point. */
const AIR_PAIR_MAX_SKEW_MS = 10 * 60_000;
/** Hysteresis on the dew-point margin, °C (common practice: a little above the alarm margin). */
const CONDENSATION_HYSTERESIS_C = 0.5;
/** Silence is a yes/no "value": 1 silent, 0 reporting; out of this window is silent. */
const SILENCE_WINDOW: EvaluationWindow = { min: -1, max: 0.5, delayS: 0, hysteresis: 0 };

const windowKey = (benchId: number, quantity: string) => `window:${benchId}:${quantity}`;
const condensationKey = (benchId: number) => `condensation:${benchId}`;
const silenceKey = (sensorId: string) => `silent:${sensorId}`;

/**
 * The alert engine. It evaluates every stored reading and, on a timer, every tracker, with the
 * shared window evaluation; keeps each tracker's state and each alert in SQLite (so a restart
 * resumes exactly where it was and sends nothing twice); and writes notices that the notifier
 * groups into e-mail. All work runs one step at a time through a queue, so evaluation order is
 * the order readings were committed.
 *
 * With several server instances only the one holding the lease runs it (start() when it takes the
 * lease, stop() when it loses it); on the others evaluation does nothing, and acknowledge() works
 * on the stored tracker, which the running engine then re-reads (reloadTracker).
 */
export class AlertEngine {
  private readonly trackers = new Map<string, Tracker>();
  private readonly lastSeenMs = new Map<string, number>();
  private readonly air = new Map<number, AirPair>();
  private queue: Promise<unknown> = Promise.resolve();
  private startedAtMs = 0;
  private noticesWritten = false;
  private waitingRows: ReadingRow[] | null = null;
  private waitingDone: Promise<void> | null = null;
  private running = false;
  /** Told after a commit that wrote notices, so the notifier can run when their group is due. */
  onNoticesWritten: () => void = () => {};
  /** Told when acknowledge() changed a stored tracker the engine does not run here (another instance must re-read it). */
  onTrackerStored: (alertId: number) => void = () => {};

  constructor(
    private readonly dataSource: DataSource,
    private readonly windows: WindowsService,
    private readonly layout: LayoutCache,
    private readonly metrics: Metrics,
    private readonly logger: Logger,
    private readonly config: AlertEngineConfig,
    private readonly now: () => number,
    /** Told about every alert that changed (for the live stream). */
    private readonly onAlertsChanged: (alertIds: number[]) => void,
  ) {}

  /** Whether this instance runs the engine (holds the lease). */
  get isRunning(): boolean {
    return this.running;
  }

  /** Start evaluating: load the saved trackers and each sensor's last reading time afresh. */
  start(): Promise<void> {
    return this.enqueue(async () => {
      this.trackers.clear();
      this.lastSeenMs.clear();
      this.air.clear();
      await this.load();
      this.running = true;
    });
  }

  /** Stop evaluating (another instance has the lease) once the step in progress is done. */
  stop(): Promise<void> {
    return this.enqueue(async () => {
      this.running = false;
      this.trackers.clear();
      this.waitingRows = null;
    });
  }

  private async load(): Promise<void> {
    this.startedAtMs = this.now();
    await this.layout.reload();
    for (const row of await this.dataSource.getRepository(AlertTrackerEntity).find()) {
      const [kind, a, b] = row.key.split(":") as [string, string, string | undefined];
      const state = JSON.parse(row.state) as WindowAlertState;
      if (kind === "window") this.trackers.set(row.key, { key: row.key, kind: "window", benchId: Number(a), quantity: b ?? null, sensorId: null, state, alertId: row.alertId });
      if (kind === "condensation") this.trackers.set(row.key, { key: row.key, kind: "condensation", benchId: Number(a), quantity: null, sensorId: null, state, alertId: row.alertId });
      if (kind === "silent") {
        const alert = row.alertId ? await this.dataSource.getRepository(AlertEntity).findOneBy({ id: row.alertId }) : null;
        this.trackers.set(row.key, { key: row.key, kind: "sensor-silent", benchId: alert?.benchId ?? 0, quantity: null, sensorId: a, state, alertId: row.alertId });
      }
    }
    const seen = (await this.dataSource.query("SELECT sensor_id AS id, MAX(time_ms) AS t FROM latest_reading GROUP BY sensor_id")) as { id: string; t: number }[];
    for (const { id, t } of seen) this.lastSeenMs.set(id, t);
  }

  private enqueue<T>(work: () => Promise<T>): Promise<T> {
    const next = this.queue.then(work, work);
    this.queue = next.catch((err: unknown) => this.logger.error({ err }, "alert engine step failed"));
    return next;
  }

  /** Readings just committed (called after every write batch). */
  onReadings(rows: readonly ReadingRow[]): Promise<void> {
    if (!this.running) return Promise.resolve();
    // Batches committed while an evaluation waits join it: one pending evaluation at most, so a
    // fast fleet cannot pile up a queue of jobs (and their rows) faster than they are evaluated.
    if (this.waitingRows) {
      this.waitingRows.push(...rows);
      return this.waitingDone!;
    }
    this.waitingRows = [...rows];
    this.waitingDone = this.enqueue(async () => {
      const batch = this.waitingRows ?? [];
      this.waitingRows = null;
      if (this.running) await this.evaluateReadings(batch);
    });
    return this.waitingDone;
  }

  /** The periodic pass: hold-off delays running out, changed windows, silence, escalation, reminders. */
  tick(): Promise<void> {
    return this.enqueue(async () => {
      if (this.running) await this.evaluateTickAll();
    });
  }

  /** A sensor's MQTT last will said "offline". */
  onSensorOffline(sensorId: string): Promise<void> {
    return this.enqueue(async () => {
      if (this.running) await this.markSilent(sensorId, this.now());
    });
  }

  /** Re-read an alert's tracker after another instance changed it (an acknowledgement). */
  reloadTracker(alertId: number): Promise<void> {
    return this.enqueue(async () => {
      if (!this.running) return;
      const row = await this.dataSource.getRepository(AlertTrackerEntity).findOneBy({ alertId });
      const tracker = row && this.trackers.get(row.key);
      if (tracker) tracker.state = JSON.parse(row.state) as WindowAlertState;
    });
  }

  /** Someone took the alert: re-notification stops. Refused when it is not raised (anymore). */
  acknowledge(alertId: number, user: { id: number; name: string }, note?: string): Promise<AlertRecord> {
    return this.enqueue(async () => {
      const alert = await this.dataSource.getRepository(AlertEntity).findOneBy({ id: alertId });
      if (!alert) throw new AppError("alert-not-found", `There is no alert ${alertId}`, 404);
      if (alert.phase !== "raised") {
        const detail =
          alert.phase === "acknowledged"
            ? `Already acknowledged by ${alert.acknowledgedByName ?? "someone"}`
            : alert.phase === "cleared"
              ? "This alert has already cleared"
              : "This alert has not been raised yet";
        throw new AppError("alert-not-acknowledgeable", detail, 409);
      }
      const nowMs = this.now();
      let storedElsewhere = false;
      let acknowledged = () => {};
      await this.dataSource.transaction(async (tx) => {
        // The running engine's tracker, or (on another instance) the stored one, which the running engine re-reads.
        const tracker = this.running ? [...this.trackers.values()].find((t) => t.alertId === alertId) : undefined;
        const stored = tracker ? null : await tx.getRepository(AlertTrackerEntity).findOneBy({ alertId });
        const state = tracker?.state ?? (stored ? (JSON.parse(stored.state) as WindowAlertState) : null);
        const result = state && acknowledgeAlert(state, nowMs, String(user.id));
        if (result?.ok) {
          if (tracker) {
            await this.saveTracker(tx, { ...tracker, state: result.state });
            acknowledged = () => (tracker.state = result.state);
          } else if (stored) {
            await tx.getRepository(AlertTrackerEntity).save({ ...stored, state: JSON.stringify(result.state) });
            storedElsewhere = true;
          }
        }
        // Only while still raised: someone on another instance may have taken it a moment ago.
        const taken = await tx.getRepository(AlertEntity).update(
          { id: alertId, phase: "raised" },
          { phase: "acknowledged", acknowledgedAtMs: nowMs, acknowledgedByUserId: user.id, acknowledgedByName: user.name, acknowledgeNote: note || null, updatedAtMs: nowMs },
        );
        if (taken.affected === 0) throw new AppError("alert-not-acknowledgeable", "Someone acknowledged this alert a moment ago", 409);
      });
      acknowledged(); // the running engine's tracker, once committed
      this.metrics.alertTransitions.inc({ kind: alert.kind, step: "acknowledged" });
      if (storedElsewhere) this.onTrackerStored(alertId);
      this.onAlertsChanged([alertId]);
      return (await this.dataSource.getRepository(AlertEntity).findOneByOrFail({ id: alertId }));
    });
  }

  /** Wait for everything queued so far (tests, shutdown). */
  async idle(): Promise<void> {
    await this.queue;
  }

  // ── evaluation ───────────────────────────────────────────────────────────

  private tracker(key: string, init: Omit<Tracker, "key" | "state" | "alertId">): Tracker {
    let t = this.trackers.get(key);
    if (!t) {
      t = { key, ...init, state: initialWindowAlertState(), alertId: null };
      this.trackers.set(key, t);
    }
    return t;
  }

  private async evaluateReadings(rows: readonly ReadingRow[]): Promise<void> {
    const nowMs = this.now();
    const ordered = [...rows].sort((a, b) => a.timeMs - b.timeMs);
    const changed: number[] = [];
    await this.dataSource.transaction(async (tx) => {
      for (const row of ordered) {
        this.lastSeenMs.set(row.sensorId, Math.max(this.lastSeenMs.get(row.sensorId) ?? 0, row.timeMs));
        const silence = this.trackers.get(silenceKey(row.sensorId));
        if (silence && silence.state.phase !== "idle") {
          // Arrival time, not the reading's: a sensor back from a dropout may send buffered old readings.
          const result = evaluateSample(silence.state, SILENCE_WINDOW, { timeMs: Math.max(nowMs, silence.state.lastSampleMs ?? 0), value: 0 });
          await this.step(tx, silence, result.transitions, result.state, nowMs, changed, null);
        }
        if (row.benchId === null || !WINDOWED.has(row.quantity)) continue;
        const window = this.windows.windowFor(row.benchId, row.quantity);
        if (window) {
          const t = this.tracker(windowKey(row.benchId, row.quantity), { kind: "window", benchId: row.benchId, quantity: row.quantity, sensorId: null });
          // A probe whose clock runs ahead must not shorten the hold-off: never evaluate a reading later than now.
          const result = evaluateSample(t.state, window, { timeMs: Math.min(row.timeMs, nowMs), value: row.value });
          if (!result.ignored) await this.step(tx, t, result.transitions, result.state, nowMs, changed, row.value);
        }
        if (row.quantity === "air.temperature" || row.quantity === "air.humidity") await this.evaluateCondensation(tx, row, nowMs, changed);
      }
    });
    this.announceNotices();
    if (changed.length) this.onAlertsChanged([...new Set(changed)]);
  }

  private async evaluateCondensation(tx: EntityManager, row: ReadingRow, nowMs: number, changed: number[]): Promise<void> {
    const benchId = row.benchId as number;
    const pair = this.air.get(benchId) ?? {};
    const slot = row.quantity === "air.temperature" ? "tempC" : "rhPct";
    if (!pair[slot] || row.timeMs >= pair[slot]!.timeMs) pair[slot] = { value: row.value, timeMs: row.timeMs };
    this.air.set(benchId, pair);
    if (!pair.tempC || !pair.rhPct || Math.abs(pair.tempC.timeMs - pair.rhPct.timeMs) > AIR_PAIR_MAX_SKEW_MS) return;
    const dew = dewPointC(pair.tempC.value, pair.rhPct.value);
    if (dew === undefined) return;
    const marginC = pair.tempC.value - dew;
    const airWindow = this.windows.windowFor(benchId, "air.temperature");
    const window: EvaluationWindow = {
      min: this.windows.dewPointMarginFor(benchId),
      max: Number.MAX_VALUE,
      delayS: airWindow?.delayS ?? 600,
      hysteresis: CONDENSATION_HYSTERESIS_C,
    };
    const t = this.tracker(condensationKey(benchId), { kind: "condensation", benchId, quantity: null, sensorId: null });
    const result = evaluateSample(t.state, window, { timeMs: Math.min(Math.max(pair.tempC.timeMs, pair.rhPct.timeMs), nowMs), value: marginC });
    if (!result.ignored) await this.step(tx, t, result.transitions, result.state, nowMs, changed, marginC);
  }

  private async markSilent(sensorId: string, nowMs: number, changed: number[] = []): Promise<void> {
    const sensor = await this.dataSource.getRepository(SensorEntity).findOneBy({ id: sensorId });
    if (!sensor || sensor.benchId === null || sensor.disabledAtMs !== null) return;
    const t = this.tracker(silenceKey(sensorId), { kind: "sensor-silent", benchId: sensor.benchId, quantity: null, sensorId });
    if (t.state.phase !== "idle") return;
    t.benchId = sensor.benchId;
    const result = evaluateSample(t.state, SILENCE_WINDOW, { timeMs: Math.max(nowMs, t.state.lastSampleMs ?? 0), value: 1 });
    await this.dataSource.transaction((tx) => this.step(tx, t, result.transitions, result.state, nowMs, changed, null));
    this.announceNotices();
    if (changed.length) this.onAlertsChanged(changed);
  }

  private async evaluateTickAll(): Promise<void> {
    const nowMs = this.now();
    await this.layout.reload();
    await this.windows.reload();
    const changed: number[] = [];
    await this.dataSource.transaction(async (tx) => {
      for (const t of this.trackers.values()) {
        if (t.kind !== "window" || t.quantity === null) continue;
        const window = this.windows.windowFor(t.benchId, t.quantity);
        if (!window) continue;
        const result = evaluateTick(t.state, window, nowMs);
        await this.step(tx, t, result.transitions, result.state, nowMs, changed, t.state.lastValue);
      }
      await this.escalateAndRemind(tx, nowMs, changed);
    });
    this.announceNotices();
    // Silence: every enabled sensor on a bench that has not reported for the limit (counted from
    // start-up for one never heard from, so a restart does not call the whole fleet silent).
    const sensors = await this.dataSource.getRepository(SensorEntity).find();
    for (const s of sensors) {
      if (s.benchId === null || s.disabledAtMs !== null) continue;
      const lastMs = Math.max(this.lastSeenMs.get(s.id) ?? 0, this.startedAtMs);
      if (nowMs - lastMs >= this.config.silentAfterMs) await this.markSilent(s.id, nowMs, changed);
    }
    if (changed.length) this.onAlertsChanged([...new Set(changed)]);
  }

  private async escalateAndRemind(tx: EntityManager, nowMs: number, changed: number[]): Promise<void> {
    const raised = await tx.getRepository(AlertEntity).find({ where: { phase: "raised" } });
    for (const alert of raised) {
      const { escalateAfterMs, renotifyEveryMs } = this.timingOfZone(alert.zoneId);
      if (alert.escalatedAtMs === null && alert.raisedAtMs !== null && nowMs - alert.raisedAtMs >= escalateAfterMs) {
        await this.notice(tx, alert, "escalation", nowMs);
        await tx.getRepository(AlertEntity).update({ id: alert.id }, { escalatedAtMs: nowMs, updatedAtMs: nowMs });
        changed.push(alert.id);
      }
      if (alert.lastNotifiedMs !== null && nowMs - alert.lastNotifiedMs >= renotifyEveryMs) {
        await this.notice(tx, alert, "reminder", nowMs);
        await tx.getRepository(AlertEntity).update({ id: alert.id }, { lastNotifiedMs: nowMs, updatedAtMs: nowMs });
      }
    }
  }

  /** The zone's site's escalation and reminder times (set on the duty rota page), else the server's defaults. */
  private timingOfZone(zoneId: number): { escalateAfterMs: number; renotifyEveryMs: number } {
    const site = this.layout.siteOfZone(zoneId);
    const escalateAfterS = site?.escalateAfterS ?? null;
    const renotifyEveryS = site?.renotifyEveryS ?? null;
    return {
      escalateAfterMs: escalateAfterS === null ? this.config.escalateAfterMs : escalateAfterS * 1000,
      renotifyEveryMs: renotifyEveryS === null ? this.config.renotifyEveryMs : renotifyEveryS * 1000,
    };
  }

  private async notice(tx: EntityManager, alert: AlertRecord, type: NoticeType, nowMs: number): Promise<void> {
    await tx.getRepository(AlertNoticeEntity).insert({ alertId: alert.id, zoneId: alert.zoneId, type, createdAtMs: nowMs, queuedAtMs: null });
    this.noticesWritten = true;
  }

  private announceNotices(): void {
    if (!this.noticesWritten) return;
    this.noticesWritten = false;
    this.onNoticesWritten();
  }

  private async saveTracker(tx: EntityManager, t: Tracker): Promise<void> {
    await tx.getRepository(AlertTrackerEntity).save({ key: t.key, alertId: t.alertId, state: JSON.stringify(t.state) });
  }

  /**
   * Applies one evaluation's transitions to the alert rows and notices. The tracker is saved when
   * its phase changed; a plain new sample only updates the open alert's values.
   */
  private async step(
    tx: EntityManager,
    t: Tracker,
    transitions: WindowTransition[],
    nextState: WindowAlertState,
    nowMs: number,
    changed: number[],
    value: number | null,
  ): Promise<void> {
    const phaseBefore = t.state.phase;
    t.state = nextState;
    const alerts = tx.getRepository(AlertEntity);
    for (const tr of transitions) {
      this.metrics.alertTransitions.inc({ kind: t.kind, step: tr.kind });
      if (tr.kind === "watching") {
        const zone = this.layout.zoneOf(t.benchId);
        if (!zone) continue;
        const inserted = await alerts.insert({
          benchId: t.benchId,
          zoneId: zone.id,
          kind: t.kind,
          quantity: t.quantity,
          direction: t.kind === "window" ? tr.direction : null,
          sensorId: t.sensorId,
          phase: "watching",
          sinceMs: tr.sinceMs,
          raisedAtMs: null,
          acknowledgedAtMs: null,
          acknowledgedByUserId: null,
          acknowledgedByName: null,
          acknowledgeNote: null,
          clearedAtMs: null,
          worstValue: t.kind === "sensor-silent" ? null : tr.worstValue,
          lastValue: t.kind === "sensor-silent" ? null : tr.value,
          lastNotifiedMs: null,
          escalatedAtMs: null,
          updatedAtMs: nowMs,
        });
        t.alertId = inserted.identifiers[0]!.id as number;
        changed.push(t.alertId);
      } else if (tr.kind === "dropped") {
        // A watching excursion back inside before its delay: dropped silently, no trace kept.
        if (t.alertId !== null) {
          await alerts.delete({ id: t.alertId });
          changed.push(t.alertId);
        }
        t.alertId = null;
      } else if (tr.kind === "raised" && t.alertId !== null) {
        // raisedAtMs is when we told people, the clock escalation and reminders count from.
        await alerts.update({ id: t.alertId }, { phase: "raised", raisedAtMs: nowMs, lastNotifiedMs: nowMs, lastValue: t.kind === "sensor-silent" ? null : tr.value, updatedAtMs: nowMs });
        const alert = await alerts.findOneByOrFail({ id: t.alertId });
        await this.notice(tx, alert, "raised", nowMs);
        changed.push(t.alertId);
      } else if (tr.kind === "cleared" && t.alertId !== null) {
        await alerts.update({ id: t.alertId }, { phase: "cleared", clearedAtMs: tr.atMs, lastValue: t.kind === "sensor-silent" ? null : tr.value, updatedAtMs: nowMs });
        const alert = await alerts.findOneByOrFail({ id: t.alertId });
        await this.notice(tx, alert, "cleared", nowMs);
        changed.push(t.alertId);
        t.alertId = null;
      }
    }
    if (transitions.length > 0 || phaseBefore !== t.state.phase) await this.saveTracker(tx, t);
    // The open alert shows the newest value (a raise carries the value held at the due time).
    if (t.alertId !== null && value !== null && t.kind !== "sensor-silent") {
      await alerts.update({ id: t.alertId }, { lastValue: value, worstValue: t.state.worstValue, updatedAtMs: nowMs });
    }
  }
}
