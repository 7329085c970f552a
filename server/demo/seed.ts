import { writeFileSync } from "node:fs";
import type { DataSource } from "typeorm";
import { BUILT_IN_PRESETS, DEFAULT_PRESET_ID } from "../../shared/domain/window-guidance.js";
import type { WindowedQuantity } from "../../shared/schemas/quantities.js";
import type { SensorKind } from "../../shared/schemas/quantities.js";
import { AppMetaEntity } from "../db/entities/app-meta.entity.js";
import { BenchEntity } from "../db/entities/bench.entity.js";
import { SensorEntity } from "../db/entities/sensor.entity.js";
import { SiteEntity } from "../db/entities/site.entity.js";
import { UserEntity } from "../db/entities/user.entity.js";
import { ZoneWindowEntity } from "../db/entities/window.entity.js";
import { ZoneEntity } from "../db/entities/zone.entity.js";
import { generateSecret, hashSecret } from "../modules/sensors/sensors.service.js";

/** One line of demo-sensors.json (PRODUCT.md §4, demo mode): what the simulator needs to play a sensor. */
export interface DemoSensorCredential {
  id: string;
  secret: string;
  benchId: number;
  benchName: string;
  kind: SensorKind;
}

/**
 * The rooting window every demo zone starts with, in stored units: the built-in "Warm rooting"
 * preset (shared/domain/window-guidance.ts, where each value's source is noted), so the demo
 * starts from the same values a manager would pick and raises no guidance warning. The
 * simulator's normal night stays inside it (sensors-sim/model/params.ts).
 */
export const DEMO_WINDOW: Record<WindowedQuantity, { min: number; max: number; delayS: number; hysteresis: number }> = demoWindow();

function demoWindow() {
  const preset = BUILT_IN_PRESETS.find((p) => p.id === DEFAULT_PRESET_ID);
  if (!preset) throw new Error(`built-in preset ${DEFAULT_PRESET_ID} is missing`);
  return Object.fromEntries(preset.windows.map(({ quantity, min, max, delayS, hysteresis }) => [quantity, { min, max, delayS, hysteresis }])) as Record<
    WindowedQuantity,
    { min: number; max: number; delayS: number; hysteresis: number }
  >;
}

/** The invented nursery: one site, three houses, twelve benches. */
const DEMO_NURSERY = {
  site: { name: "Hollin Lane Nursery", timeZone: "America/Chicago" },
  zones: [
    { name: "House 1 · Fig cuttings", code: "h1", benches: ["Bench 1", "Bench 2", "Bench 3", "Bench 4"] },
    { name: "House 2 · Pomegranate & mulberry", code: "h2", benches: ["Bench 1", "Bench 2", "Bench 3", "Bench 4"] },
    { name: "House 3 · Grafted stock", code: "h3", benches: ["Bench 1", "Bench 2", "Bench 3", "Bench 4"] },
  ],
};

export const DEMO_META_KEY = "demo-nursery";

/** True when this database holds the demo nursery (seeded by us). */
export async function isDemoDatabase(dataSource: DataSource): Promise<boolean> {
  return (await dataSource.getRepository(AppMetaEntity).countBy({ key: DEMO_META_KEY })) > 0;
}

/** Nothing in it yet: no site and no user (an admin made with admin:create counts as something). */
export async function isEmptyDatabase(dataSource: DataSource): Promise<boolean> {
  return (await dataSource.getRepository(SiteEntity).count()) === 0 && (await dataSource.getRepository(UserEntity).count()) === 0;
}

/**
 * Seed the demo nursery in one transaction and return each sensor's credentials. The first two
 * benches of each house carry separate air and medium probes, the others one combined probe.
 */
export async function seedDemoNursery(dataSource: DataSource, nowMs = Date.now()): Promise<DemoSensorCredential[]> {
  return dataSource.transaction(async (tx) => {
    const site = await tx.getRepository(SiteEntity).save({ ...DEMO_NURSERY.site, createdAtMs: nowMs });
    const credentials: DemoSensorCredential[] = [];
    for (const [zoneIndex, z] of DEMO_NURSERY.zones.entries()) {
      const zone = await tx.getRepository(ZoneEntity).save({ siteId: site.id, name: z.name, position: zoneIndex, archivedAtMs: null });
      await tx.getRepository(ZoneWindowEntity).save(
        Object.entries(DEMO_WINDOW).map(([quantity, w]) => ({
          zoneId: zone.id,
          quantity: quantity as WindowedQuantity,
          minValue: w.min,
          maxValue: w.max,
          delayS: w.delayS,
          hysteresis: w.hysteresis,
        })),
      );
      for (const [benchIndex, benchName] of z.benches.entries()) {
        const bench = await tx.getRepository(BenchEntity).save({ zoneId: zone.id, name: benchName, position: benchIndex, archivedAtMs: null });
        const kinds: SensorKind[] = benchIndex < 2 ? ["air", "medium"] : ["combined"];
        for (const kind of kinds) {
          const id = `${z.code}-b${benchIndex + 1}-${kind}`;
          const secret = generateSecret();
          await tx.getRepository(SensorEntity).save({ id, kind, secretHash: hashSecret(secret), benchId: bench.id, createdAtMs: nowMs });
          credentials.push({ id, secret, benchId: bench.id, benchName: `${z.name} – ${benchName}`, kind });
        }
      }
    }
    await tx.getRepository(AppMetaEntity).save({ key: DEMO_META_KEY, value: new Date(nowMs).toISOString() });
    return credentials;
  });
}

/**
 * Give every demo sensor a fresh secret: used when demo-sensors.json went missing, since only
 * hashes are stored and the simulator needs the secrets.
 */
export async function rotateDemoSecrets(dataSource: DataSource): Promise<DemoSensorCredential[]> {
  return dataSource.transaction(async (tx) => {
    const sensors = await tx.getRepository(SensorEntity).find({ order: { id: "ASC" } });
    const benches = await tx.getRepository(BenchEntity).find();
    const zones = await tx.getRepository(ZoneEntity).find();
    const credentials: DemoSensorCredential[] = [];
    for (const sensor of sensors) {
      if (sensor.benchId === null) continue;
      const bench = benches.find((b) => b.id === sensor.benchId);
      const zone = zones.find((zn) => zn.id === bench?.zoneId);
      const secret = generateSecret();
      await tx.getRepository(SensorEntity).update({ id: sensor.id }, { secretHash: hashSecret(secret) });
      credentials.push({ id: sensor.id, secret, benchId: sensor.benchId, benchName: `${zone?.name ?? ""} – ${bench?.name ?? ""}`, kind: sensor.kind });
    }
    return credentials;
  });
}

export function writeDemoCredentials(path: string, credentials: DemoSensorCredential[]): void {
  writeFileSync(path, JSON.stringify(credentials, null, 2) + "\n", { mode: 0o600 });
}

/** The demo's people, one per role (PRODUCT.md §4): invented names, `<role>@nursery.test`. */
export const DEMO_USERS = [
  { name: "Imogen Vale", email: "admin@nursery.test", role: "admin" },
  { name: "Tobias Fenwick", email: "manager@nursery.test", role: "manager" },
  { name: "Marisol Ortega", email: "grower@nursery.test", role: "grower" },
  { name: "Dev Kapoor", email: "viewer@nursery.test", role: "viewer" },
] as const;
