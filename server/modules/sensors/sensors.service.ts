import { createHash, randomBytes, timingSafeEqual } from "node:crypto";
import { IsNull, MoreThanOrEqual, type DataSource, type EntityManager } from "typeorm";
import { isIdentity, type SensorCalibration } from "../../../shared/domain/calibration.js";
import { WINDOWED_QUANTITIES, type WindowedQuantity } from "../../../shared/schemas/quantities.js";
import type { AuditChange, AuditValueKind } from "../../../shared/schemas/audit.js";
import { MAX_ASSIGNMENT_BACKDATE_MS, type AssignSensorInput, type AssignSensorResponse, type SensorAssignment } from "../../../shared/schemas/layout.js";
import {
  sensorCalibrationSchema,
  type RegisterSensorInput,
  type SensorCalibrationInput,
  type SensorSecretResponse,
  type SensorView,
  type UpdateSensorInput,
} from "../../../shared/schemas/sensors.js";
import { BenchEntity, type Bench } from "../../db/entities/bench.entity.js";
import { LatestReadingEntity, ReadingEntity } from "../../db/entities/reading.entity.js";
import { SensorAssignmentEntity, type SensorAssignmentRecord } from "../../db/entities/sensor-assignment.entity.js";
import { SensorEntity, type Sensor } from "../../db/entities/sensor.entity.js";
import { ZoneEntity } from "../../db/entities/zone.entity.js";
import { AppError, notFound } from "../../lib/errors.js";
import { auditChange, writeAuditEntry } from "../audit/audit.service.js";
import type { ReadingStore } from "../readings/reading-store.js";

/** The calibration stored with a sensor; a row that does not parse reads every quantity as measured. */
export function parseCalibration(json: string): SensorCalibration {
  let value: unknown;
  try {
    value = JSON.parse(json);
  } catch {
    return {};
  }
  const parsed = sensorCalibrationSchema.safeParse(value);
  return parsed.success ? dropIdentity(parsed.data) : {};
}

/** Only the quantities that are corrected: {offset 0, gain 1} is no calibration at all. */
function dropIdentity(calibration: SensorCalibrationInput): SensorCalibration {
  const out: SensorCalibration = {};
  for (const q of WINDOWED_QUANTITIES) {
    const c = calibration[q];
    if (c && !isIdentity(c)) out[q] = { offset: c.offset, gain: c.gain };
  }
  return out;
}

/** How the audit list shows an offset of each quantity (a difference, in the reader's units). */
const OFFSET_KIND: Record<WindowedQuantity, AuditValueKind> = {
  "air.temperature": "temperature-difference",
  "air.humidity": "humidity",
  "medium.temperature": "temperature-difference",
  "medium.moisture": "moisture",
};

function calibrationChanges(before: SensorCalibration, after: SensorCalibration): AuditChange[] {
  const changes: AuditChange[] = [];
  for (const quantity of WINDOWED_QUANTITIES) {
    const [was, now] = [before[quantity] ?? { offset: 0, gain: 1 }, after[quantity] ?? { offset: 0, gain: 1 }];
    if (was.offset !== now.offset) changes.push(auditChange("offset", OFFSET_KIND[quantity], was.offset, now.offset, { quantity }));
    if (was.gain !== now.gain) changes.push(auditChange("gain", "number", was.gain, now.gain, { quantity }));
  }
  return changes;
}

export function hashSecret(secret: string): string {
  return createHash("sha256").update(secret, "utf8").digest("hex");
}

/** A new device secret: 32 random bytes, URL-safe. Shown once, stored only as a hash. */
export function generateSecret(): string {
  return randomBytes(32).toString("base64url");
}

/** Sensor credentials and bench assignment, cached for the ingest path. */
export class SensorsService {
  private cache = new Map<string, Sensor>();
  private parsedCalibrations = new WeakMap<Sensor, SensorCalibration>();
  /** Told when a sensor's credentials stop being valid, so the broker can drop its connection. */
  onRevoked: (sensorId: string) => void = () => {};
  /** Told after a sensor's settings changed here, so other server instances drop their cached copy. */
  onChanged: (sensorId: string) => void = () => {};

  constructor(
    private readonly dataSource: DataSource,
    private readonly readings?: ReadingStore,
  ) {}

  private changed(id: string): void {
    this.cache.delete(id);
    this.onChanged(id);
  }

  /** Drop a cached sensor another instance changed; the next message re-reads it. */
  forget(id: string): void {
    this.cache.delete(id);
  }

  async reload(): Promise<void> {
    const sensors = await this.dataSource.getRepository(SensorEntity).find();
    this.cache = new Map(sensors.map((s) => [s.id, s]));
    await this.reconcileAssignments(sensors);
  }

  // ── assignment history ───────────────────────────────────────────────────

  /**
   * Makes each sensor's open assignment match its bench (sensors written without one, e.g. by the
   * demo seed, get one from when they were registered). Bookkeeping at start-up; not audited.
   */
  private async reconcileAssignments(sensors: Sensor[], nowMs = Date.now()): Promise<void> {
    const repo = this.dataSource.getRepository(SensorAssignmentEntity);
    const [open, any] = await Promise.all([repo.findBy({ toMs: IsNull() }), repo.find({ select: { sensorId: true } })]);
    const openBySensor = new Map(open.map((a) => [a.sensorId, a]));
    const withHistory = new Set(any.map((a) => a.sensorId));
    const fixes = sensors.filter((s) => (openBySensor.get(s.id)?.benchId ?? null) !== s.benchId);
    if (fixes.length === 0) return;
    await this.dataSource.transaction(async (tx) => {
      for (const s of fixes) {
        await this.moveAssignment(tx, s.id, s.benchId, withHistory.has(s.id) ? nowMs : Math.min(s.createdAtMs, nowMs));
      }
    });
  }

  /** Closes the sensor's open assignment at `atMs` and opens one on `benchId` (none for null). */
  private async moveAssignment(manager: EntityManager, sensorId: string, benchId: number | null, atMs: number): Promise<void> {
    const repo = manager.getRepository(SensorAssignmentEntity);
    await repo.update({ sensorId, toMs: IsNull() }, { toMs: atMs });
    if (benchId !== null) await repo.insert({ sensorId, benchId, fromMs: atMs, toMs: null });
  }

  private async benchLabel(manager: EntityManager, benchId: number | null): Promise<{ bench: Bench | null; zoneId: number | null; siteId: number | null; label: string | null }> {
    if (benchId === null) return { bench: null, zoneId: null, siteId: null, label: null };
    const bench = await manager.getRepository(BenchEntity).findOneBy({ id: benchId });
    const zone = bench ? await manager.getRepository(ZoneEntity).findOneBy({ id: bench.zoneId }) : null;
    return { bench, zoneId: zone?.id ?? null, siteId: zone?.siteId ?? null, label: bench ? `${zone?.name ?? ""} › ${bench.name}` : `Bench ${benchId}` };
  }

  /** Moves a sensor (open assignment, sensor.bench_id, audit) inside the caller's transaction. */
  private async recordMove(
    manager: EntityManager,
    sensorId: string,
    fromBenchId: number | null,
    toBenchId: number | null,
    atMs: number,
    recordedAtMs: number,
    note: string | null = null,
  ): Promise<void> {
    await manager.getRepository(SensorEntity).update({ id: sensorId }, { benchId: toBenchId });
    await this.moveAssignment(manager, sensorId, toBenchId, atMs);
    const from = await this.benchLabel(manager, fromBenchId);
    const to = await this.benchLabel(manager, toBenchId);
    await writeAuditEntry(
      manager,
      {
        entityType: "sensor-assignment",
        entityId: sensorId,
        action: "assigned",
        subject: `Sensor ${sensorId}`,
        siteId: to.siteId ?? from.siteId,
        zoneId: to.zoneId ?? from.zoneId,
        previousZoneId: from.zoneId !== null && from.zoneId !== to.zoneId ? from.zoneId : null,
        benchId: toBenchId ?? fromBenchId,
        changes: [
          auditChange("benchId", "reference", fromBenchId, toBenchId, { oldLabel: from.label, newLabel: to.label }),
          ...(atMs !== recordedAtMs ? [auditChange("effectiveFromMs", "time", null, atMs)] : []),
        ],
        note,
      },
      recordedAtMs,
    );
  }

  private async assignmentViews(where: { sensorId: string } | { benchId: number }): Promise<SensorAssignment[]> {
    const rows: SensorAssignmentRecord[] = await this.dataSource.getRepository(SensorAssignmentEntity).find({ where, order: { fromMs: "DESC", id: "DESC" } });
    const [benches, zones] = await Promise.all([this.dataSource.getRepository(BenchEntity).find(), this.dataSource.getRepository(ZoneEntity).find()]);
    return rows.map((a) => {
      const bench = benches.find((b) => b.id === a.benchId);
      const zone = zones.find((z) => z.id === bench?.zoneId);
      return { id: a.id, sensorId: a.sensorId, benchId: a.benchId, benchName: bench?.name ?? "", zoneId: zone?.id ?? 0, zoneName: zone?.name ?? "", fromMs: a.fromMs, toMs: a.toMs };
    });
  }

  /** Where a sensor has been, newest first. */
  async assignmentsOfSensor(id: string): Promise<SensorAssignment[]> {
    if (!(await this.dataSource.getRepository(SensorEntity).existsBy({ id }))) throw notFound("sensor-not-found", `There is no sensor ${id}`);
    return this.assignmentViews({ sensorId: id });
  }

  /** Which sensors a bench has had, newest first. */
  async assignmentsOfBench(benchId: number): Promise<SensorAssignment[]> {
    if (!(await this.dataSource.getRepository(BenchEntity).existsBy({ id: benchId }))) throw notFound("bench-not-found", `There is no bench ${benchId}`);
    return this.assignmentViews({ benchId });
  }

  /**
   * Put a sensor on a bench (or take it off) as of `fromMs` (default now). Dated in the past, the
   * sensor's readings since then are re-filed onto the new bench, so a move entered late does not
   * leave them on the bench it had left. Not before the current assignment began, nor over 7 days back.
   */
  async assign(id: string, input: AssignSensorInput, nowMs = Date.now()): Promise<AssignSensorResponse> {
    const sensor = await this.dataSource.getRepository(SensorEntity).findOneBy({ id });
    if (!sensor) throw notFound("sensor-not-found", `There is no sensor ${id}`);
    await this.assertBench(input.benchId);
    const fromMs = input.fromMs ?? nowMs;
    const open = await this.dataSource.getRepository(SensorAssignmentEntity).findOneBy({ sensorId: id, toMs: IsNull() });
    const tooEarly = (message: string) => new AppError("assignment-time-invalid", message, 400, [{ path: "fromMs", message }]);
    if (fromMs > nowMs + 60_000) throw tooEarly("A move cannot be dated in the future");
    if (fromMs < nowMs - MAX_ASSIGNMENT_BACKDATE_MS) throw tooEarly("A move can be dated at most 7 days back");
    if (open && fromMs <= open.fromMs) throw tooEarly("The sensor was put on its current bench after that time");
    if (input.benchId === sensor.benchId) throw new AppError("assignment-unchanged", `Sensor ${id} is already there`, 409, [{ path: "benchId", message: "Choose another bench" }]);

    let refiled = 0;
    await this.dataSource.transaction(async (tx) => {
      const atMs = Math.min(fromMs, nowMs);
      if (atMs < nowMs) {
        refiled = await this.countSince(tx, id, atMs);
        await tx.getRepository(ReadingEntity).update({ sensorId: id, timeMs: MoreThanOrEqual(atMs) }, { benchId: input.benchId });
        await tx.getRepository(LatestReadingEntity).update({ sensorId: id, timeMs: MoreThanOrEqual(atMs) }, { benchId: input.benchId });
      }
      await this.recordMove(tx, id, sensor.benchId, input.benchId, atMs, nowMs, refiled > 0 ? `Dated back; ${refiled} readings re-filed to the new bench` : null);
    });
    this.changed(id);
    return { assignments: await this.assignmentViews({ sensorId: id }), readingsRefiled: refiled };
  }

  private async countSince(manager: EntityManager, sensorId: string, atMs: number): Promise<number> {
    return manager.getRepository(ReadingEntity).countBy({ sensorId, timeMs: MoreThanOrEqual(atMs) });
  }

  private async find(id: string): Promise<Sensor | undefined> {
    const cached = this.cache.get(id);
    if (cached) return cached;
    const found = await this.dataSource.getRepository(SensorEntity).findOneBy({ id });
    if (found) this.cache.set(id, found);
    return found ?? undefined;
  }

  /** True when the id is an enabled sensor and the secret is its own (constant-time compare). */
  async authenticate(id: string, secret: string): Promise<boolean> {
    const sensor = await this.find(id);
    if (!sensor || sensor.disabledAtMs !== null) return false;
    const given = Buffer.from(hashSecret(secret), "hex");
    const stored = Buffer.from(sensor.secretHash, "hex");
    return given.length === stored.length && timingSafeEqual(given, stored);
  }

  /**
   * What ingest needs of a sensor, from the cache: the bench it is on now (null when unassigned)
   * and its calibration; undefined for an unknown or disabled sensor.
   */
  async ingestProfile(id: string): Promise<{ benchId: number | null; calibration: SensorCalibration } | undefined> {
    const sensor = await this.find(id);
    if (!sensor || sensor.disabledAtMs !== null) return undefined;
    // Parsed once per cached row (a change replaces the row), not once per message.
    let calibration = this.parsedCalibrations.get(sensor);
    if (!calibration) this.parsedCalibrations.set(sensor, (calibration = parseCalibration(sensor.calibration)));
    return { benchId: sensor.benchId, calibration };
  }

  // ── administration ───────────────────────────────────────────────────────

  async list(): Promise<SensorView[]> {
    const [sensors, benches, zones] = await Promise.all([
      this.dataSource.getRepository(SensorEntity).find({ order: { id: "ASC" } }),
      this.dataSource.getRepository(BenchEntity).find(),
      this.dataSource.getRepository(ZoneEntity).find(),
    ]);
    const latest = (await this.readings?.latestOnBenches()) ?? [];
    return sensors.map((s) => {
      const bench = benches.find((b) => b.id === s.benchId);
      const mine = latest.filter((l) => l.sensorId === s.id);
      return {
        id: s.id,
        kind: s.kind,
        benchId: s.benchId,
        benchName: bench?.name ?? null,
        zoneName: zones.find((z) => z.id === bench?.zoneId)?.name ?? null,
        disabled: s.disabledAtMs !== null,
        createdAtMs: s.createdAtMs,
        lastSeenMs: mine.length ? Math.max(...mine.map((l) => l.timeMs)) : null,
        batteryPct: mine.find((l) => l.quantity === "battery")?.value ?? null,
        calibration: parseCalibration(s.calibration),
      };
    });
  }

  private async view(id: string): Promise<SensorView> {
    const found = (await this.list()).find((s) => s.id === id);
    if (!found) throw notFound("sensor-not-found", `There is no sensor ${id}`);
    return found;
  }

  private async assertBench(benchId: number | null): Promise<void> {
    if (benchId === null) return;
    const bench = await this.dataSource.getRepository(BenchEntity).findOneBy({ id: benchId });
    if (!bench) {
      throw new AppError("bench-not-found", `There is no bench ${benchId}`, 400, [{ path: "benchId", message: "Choose an existing bench" }]);
    }
    if (bench.archivedAtMs !== null) {
      throw new AppError("bench-archived", `${bench.name} is archived`, 400, [{ path: "benchId", message: "Choose a bench in use" }]);
    }
  }

  async register(input: RegisterSensorInput, nowMs = Date.now()): Promise<SensorSecretResponse> {
    if (await this.dataSource.getRepository(SensorEntity).existsBy({ id: input.id })) {
      throw new AppError("sensor-id-taken", `A sensor called ${input.id} already exists`, 409, [{ path: "id", message: "This id is taken" }]);
    }
    await this.assertBench(input.benchId);
    const secret = generateSecret();
    await this.dataSource.transaction(async (tx) => {
      await tx.getRepository(SensorEntity).insert({
        id: input.id,
        kind: input.kind,
        benchId: null,
        secretHash: hashSecret(secret),
        disabledAtMs: null,
        createdAtMs: nowMs,
        calibration: "{}",
      });
      if (input.benchId !== null) await this.recordMove(tx, input.id, null, input.benchId, nowMs, nowMs);
    });
    this.changed(input.id);
    return { sensor: await this.view(input.id), secret };
  }

  /** A new secret; the old one stops working at once and a connected device is dropped. */
  async rotate(id: string): Promise<SensorSecretResponse> {
    await this.view(id);
    const secret = generateSecret();
    await this.dataSource.getRepository(SensorEntity).update({ id }, { secretHash: hashSecret(secret) });
    this.changed(id);
    this.onRevoked(id);
    return { sensor: await this.view(id), secret };
  }

  async update(id: string, input: UpdateSensorInput, nowMs = Date.now()): Promise<SensorView> {
    const current = await this.view(id);
    if (input.benchId !== undefined) await this.assertBench(input.benchId);
    const changes: Partial<Sensor> = {};
    if (input.disabled !== undefined && input.disabled !== current.disabled) changes.disabledAtMs = input.disabled ? nowMs : null;
    const calibration = input.calibration === undefined ? undefined : dropIdentity(input.calibration);
    const calibrationAudit = calibration === undefined ? [] : calibrationChanges(current.calibration, calibration);
    if (calibration !== undefined && calibrationAudit.length > 0) changes.calibration = JSON.stringify(calibration);
    await this.dataSource.transaction(async (tx) => {
      if (Object.keys(changes).length > 0) await tx.getRepository(SensorEntity).update({ id }, changes);
      // Applied to readings from now on; the ones stored keep the correction they were stored with.
      if (calibrationAudit.length > 0) {
        const where = await this.benchLabel(tx, current.benchId);
        await writeAuditEntry(
          tx,
          {
            entityType: "sensor-calibration",
            entityId: id,
            action: "updated",
            subject: `Sensor ${id}`,
            siteId: where.siteId,
            zoneId: where.zoneId,
            benchId: current.benchId,
            changes: calibrationAudit,
            note: "Applies to readings received from now on",
          },
          nowMs,
        );
      }
      // A bench change is a move: the assignment history and the audit trail record it.
      if (input.benchId !== undefined && input.benchId !== current.benchId) await this.recordMove(tx, id, current.benchId, input.benchId, nowMs, nowMs);
    });
    this.changed(id);
    if (input.disabled === true) this.onRevoked(id);
    return this.view(id);
  }
}
