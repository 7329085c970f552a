import type { DataSource } from "typeorm";
import { BenchEntity, type Bench } from "../db/entities/bench.entity.js";
import { SiteEntity, type Site } from "../db/entities/site.entity.js";
import { ZoneEntity, type Zone } from "../db/entities/zone.entity.js";

/** Benches, zones and sites by id, re-read at every engine tick (they are small and change rarely). */
export class LayoutCache {
  benches = new Map<number, Bench>();
  zones = new Map<number, Zone>();
  sites = new Map<number, Site>();

  constructor(private readonly dataSource: DataSource) {}

  async reload(): Promise<void> {
    const [benches, zones, sites] = await Promise.all([
      this.dataSource.getRepository(BenchEntity).find(),
      this.dataSource.getRepository(ZoneEntity).find(),
      this.dataSource.getRepository(SiteEntity).find(),
    ]);
    this.benches = new Map(benches.map((b) => [b.id, b]));
    this.zones = new Map(zones.map((z) => [z.id, z]));
    this.sites = new Map(sites.map((s) => [s.id, s]));
  }

  zoneOf(benchId: number): Zone | undefined {
    const bench = this.benches.get(benchId);
    return bench ? this.zones.get(bench.zoneId) : undefined;
  }

  siteOfZone(zoneId: number): Site | undefined {
    const zone = this.zones.get(zoneId);
    return zone ? this.sites.get(zone.siteId) : undefined;
  }

  timeZoneOfZone(zoneId: number): string {
    return this.siteOfZone(zoneId)?.timeZone ?? "UTC";
  }
}
