import { createHash, randomBytes, timingSafeEqual } from "node:crypto";
import type { DataSource } from "typeorm";
import type { RegisterSensorInput, SensorSecretResponse, SensorView, UpdateSensorInput } from "../../../shared/schemas/sensors.js";
import { BenchEntity } from "../../db/entities/bench.entity.js";
import { SensorEntity, type Sensor } from "../../db/entities/sensor.entity.js";
import { ZoneEntity } from "../../db/entities/zone.entity.js";
import { AppError, notFound } from "../../lib/errors.js";
import type { ReadingsRepository } from "../readings/readings.repository.js";

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
  /** Told when a sensor's credentials stop being valid, so the broker can drop its connection. */
  onRevoked: (sensorId: string) => void = () => {};

  constructor(
    private readonly dataSource: DataSource,
    private readonly readings?: ReadingsRepository,
  ) {}

  async reload(): Promise<void> {
    const sensors = await this.dataSource.getRepository(SensorEntity).find();
    this.cache = new Map(sensors.map((s) => [s.id, s]));
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

  /** The bench a sensor is on now (null when unassigned); undefined for an unknown or disabled sensor. */
  async benchOf(id: string): Promise<number | null | undefined> {
    const sensor = await this.find(id);
    return sensor && sensor.disabledAtMs === null ? sensor.benchId : undefined;
  }

  // ── administration ───────────────────────────────────────────────────────

  async list(): Promise<SensorView[]> {
    const [sensors, benches, zones] = await Promise.all([
      this.dataSource.getRepository(SensorEntity).find({ order: { id: "ASC" } }),
      this.dataSource.getRepository(BenchEntity).find(),
      this.dataSource.getRepository(ZoneEntity).find(),
    ]);
    const latest = this.readings?.latestOnBenches() ?? [];
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
      };
    });
  }

  private async view(id: string): Promise<SensorView> {
    const found = (await this.list()).find((s) => s.id === id);
    if (!found) throw notFound("sensor-not-found", `There is no sensor ${id}`);
    return found;
  }

  private async assertBench(benchId: number | null): Promise<void> {
    if (benchId !== null && !(await this.dataSource.getRepository(BenchEntity).existsBy({ id: benchId }))) {
      throw new AppError("bench-not-found", `There is no bench ${benchId}`, 400, [{ path: "benchId", message: "Choose an existing bench" }]);
    }
  }

  async register(input: RegisterSensorInput, nowMs = Date.now()): Promise<SensorSecretResponse> {
    if (await this.dataSource.getRepository(SensorEntity).existsBy({ id: input.id })) {
      throw new AppError("sensor-id-taken", `A sensor called ${input.id} already exists`, 409, [{ path: "id", message: "This id is taken" }]);
    }
    await this.assertBench(input.benchId);
    const secret = generateSecret();
    await this.dataSource.getRepository(SensorEntity).insert({
      id: input.id,
      kind: input.kind,
      benchId: input.benchId,
      secretHash: hashSecret(secret),
      disabledAtMs: null,
      createdAtMs: nowMs,
    });
    this.cache.delete(input.id);
    return { sensor: await this.view(input.id), secret };
  }

  /** A new secret; the old one stops working at once and a connected device is dropped. */
  async rotate(id: string): Promise<SensorSecretResponse> {
    await this.view(id);
    const secret = generateSecret();
    await this.dataSource.getRepository(SensorEntity).update({ id }, { secretHash: hashSecret(secret) });
    this.cache.delete(id);
    this.onRevoked(id);
    return { sensor: await this.view(id), secret };
  }

  async update(id: string, input: UpdateSensorInput, nowMs = Date.now()): Promise<SensorView> {
    const current = await this.view(id);
    if (input.benchId !== undefined) await this.assertBench(input.benchId);
    const changes: Partial<Sensor> = {};
    if (input.benchId !== undefined) changes.benchId = input.benchId;
    if (input.disabled !== undefined && input.disabled !== current.disabled) changes.disabledAtMs = input.disabled ? nowMs : null;
    await this.dataSource.getRepository(SensorEntity).update({ id }, changes);
    this.cache.delete(id);
    if (input.disabled === true) this.onRevoked(id);
    return this.view(id);
  }
}
