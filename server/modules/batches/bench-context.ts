import { In, type EntityManager } from "typeorm";
import { BenchEntity, type Bench } from "../../db/entities/bench.entity.js";
import { SiteEntity, type Site } from "../../db/entities/site.entity.js";
import { UserEntity } from "../../db/entities/user.entity.js";
import { ZoneEntity, type Zone } from "../../db/entities/zone.entity.js";
import type { Principal } from "../../lib/auth.js";
import { AppError } from "../../lib/errors.js";

/** A bench with its zone and site (for names and the site's time zone). */
export interface BenchContext {
  bench: Bench;
  zone: Zone;
  site: Site;
}

/** Benches by id with their zone and site; unknown ids are left out. */
export async function benchContexts(manager: EntityManager, benchIds: Iterable<number>): Promise<Map<number, BenchContext>> {
  const ids = [...new Set(benchIds)];
  const out = new Map<number, BenchContext>();
  if (ids.length === 0) return out;
  const benches = await manager.getRepository(BenchEntity).findBy({ id: In(ids) });
  const zones = await manager.getRepository(ZoneEntity).findBy({ id: In([...new Set(benches.map((b) => b.zoneId))]) });
  const sites = await manager.getRepository(SiteEntity).findBy({ id: In([...new Set(zones.map((z) => z.siteId))]) });
  for (const bench of benches) {
    const zone = zones.find((z) => z.id === bench.zoneId);
    const site = zone ? sites.find((s) => s.id === zone.siteId) : undefined;
    if (zone && site) out.set(bench.id, { bench, zone, site });
  }
  return out;
}

/** A bench in use (not archived, nor its zone or site), or a 400/409 naming `path`. */
export async function liveBenchContext(manager: EntityManager, benchId: number, path = "benchId"): Promise<BenchContext> {
  const context = (await benchContexts(manager, [benchId])).get(benchId);
  if (!context) throw new AppError("bench-not-found", `There is no bench ${benchId}`, 400, [{ path, message: "Choose an existing bench" }]);
  const { bench, zone, site } = context;
  if (bench.archivedAtMs !== null || zone.archivedAtMs !== null || site.archivedAtMs !== null) {
    throw new AppError("bench-archived", `${zone.name} › ${bench.name} is archived`, 409, [{ path, message: "Choose a bench in use" }]);
  }
  return context;
}

/** The name to record for who did something: the user's name now; the system when nobody signed in. */
export async function actorName(manager: EntityManager, actor: Principal | null): Promise<string> {
  if (!actor) return "Benchwarden";
  const user = await manager.getRepository(UserEntity).findOneBy({ id: actor.userId });
  return user?.name ?? `User ${actor.userId}`;
}

/** "House 1 · Fig cuttings › Bench 2" */
export function benchLabel(context: { bench: Bench; zone: Zone }): string {
  return `${context.zone.name} › ${context.bench.name}`;
}

/** A unique index refused the row (a racing retry stored it first), on either database. */
export function isUniqueViolation(err: unknown): boolean {
  const code = (err as { code?: string; driverError?: { code?: string } } | null)?.driverError?.code ?? (err as { code?: string } | null)?.code;
  if (code === "23505") return true; // PostgreSQL's SQLSTATE unique_violation
  return typeof code === "string" && code.startsWith("SQLITE_CONSTRAINT") && /UNIQUE/i.test(String((err as Error).message));
}
