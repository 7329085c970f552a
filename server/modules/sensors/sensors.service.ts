import { createHash, randomBytes, timingSafeEqual } from "node:crypto";
import type { DataSource } from "typeorm";
import { SensorEntity, type Sensor } from "../../db/entities/sensor.entity.js";

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

  constructor(private readonly dataSource: DataSource) {}

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

  /** True when the id is a registered sensor and the secret is its own (constant-time compare). */
  async authenticate(id: string, secret: string): Promise<boolean> {
    const sensor = await this.find(id);
    if (!sensor) return false;
    const given = Buffer.from(hashSecret(secret), "hex");
    const stored = Buffer.from(sensor.secretHash, "hex");
    return given.length === stored.length && timingSafeEqual(given, stored);
  }

  /** The bench a sensor is on now (null when unassigned); undefined for an unknown sensor. */
  async benchOf(id: string): Promise<number | null | undefined> {
    return (await this.find(id))?.benchId;
  }
}
