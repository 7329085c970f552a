import { IsNull, type DataSource } from "typeorm";
import { classifyValue, combineStatuses } from "../../../shared/domain/window-status.js";
import { WINDOWED_QUANTITIES, type Quantity } from "../../../shared/schemas/quantities.js";
import type { AlertView } from "../../../shared/schemas/alerts.js";
import type { BenchSummary, LatestReading, ZoneSummary } from "../../../shared/schemas/zones.js";
import { BenchEntity } from "../../db/entities/bench.entity.js";
import { SensorEntity } from "../../db/entities/sensor.entity.js";
import { SiteEntity } from "../../db/entities/site.entity.js";
import { ZoneEntity } from "../../db/entities/zone.entity.js";
import type { ReadingStore } from "../readings/reading-store.js";
import type { WindowsService } from "../windows/windows.service.js";

const WINDOWED = new Set<Quantity>(WINDOWED_QUANTITIES);

/** The dashboard's view: every live zone with its benches, latest values and window status. */
export class ZonesService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly readings: ReadingStore,
    private readonly windows: WindowsService,
    private readonly alerts?: { openByBench(): Promise<Map<number, AlertView[]>> },
  ) {}

  async listZones(): Promise<ZoneSummary[]> {
    const [sites, zones, benches, sensors] = await Promise.all([
      this.dataSource.getRepository(SiteEntity).find(),
      this.dataSource.getRepository(ZoneEntity).find({ where: { archivedAtMs: IsNull() }, order: { position: "ASC", id: "ASC" } }),
      this.dataSource.getRepository(BenchEntity).find({ where: { archivedAtMs: IsNull() }, order: { position: "ASC", id: "ASC" } }),
      this.dataSource.getRepository(SensorEntity).find(),
    ]);
    await this.windows.ready();
    const siteName = new Map(sites.map((s) => [s.id, s.name]));
    const openAlerts = (await this.alerts?.openByBench()) ?? new Map<number, AlertView[]>();

    // Per bench and quantity, the newest value from any of its sensors.
    const latestByBench = new Map<number, Map<Quantity, LatestReading>>();
    const lastSeenBySensor = new Map<string, number>();
    for (const row of await this.readings.latestOnBenches()) {
      lastSeenBySensor.set(row.sensorId, Math.max(lastSeenBySensor.get(row.sensorId) ?? 0, row.timeMs));
      if (row.benchId === null) continue;
      const perQuantity = latestByBench.get(row.benchId) ?? new Map<Quantity, LatestReading>();
      const seen = perQuantity.get(row.quantity);
      if (!seen || row.timeMs > seen.timeMs) {
        const window = this.windows.windowFor(row.benchId, row.quantity);
        perQuantity.set(row.quantity, {
          quantity: row.quantity,
          value: row.value,
          timeMs: row.timeMs,
          sensorId: row.sensorId,
          status: WINDOWED.has(row.quantity) ? classifyValue(row.value, window) : "unknown",
        });
      }
      latestByBench.set(row.benchId, perQuantity);
    }

    const summaries = new Map<number, BenchSummary[]>();
    for (const bench of benches) {
      const latest = [...(latestByBench.get(bench.id)?.values() ?? [])];
      const summary: BenchSummary = {
        id: bench.id,
        name: bench.name,
        zoneId: bench.zoneId,
        position: bench.position,
        sensors: sensors
          .filter((s) => s.benchId === bench.id)
          .map((s) => ({ id: s.id, kind: s.kind, lastSeenMs: lastSeenBySensor.get(s.id) ?? null })),
        windows: await this.windows.windowsOf(bench.id),
        latest,
        status: combineStatuses(latest.filter((l) => WINDOWED.has(l.quantity)).map((l) => l.status)),
        alerts: openAlerts.get(bench.id) ?? [],
      };
      summaries.set(bench.zoneId, [...(summaries.get(bench.zoneId) ?? []), summary]);
    }

    return zones.map((zone) => ({
      id: zone.id,
      name: zone.name,
      siteId: zone.siteId,
      siteName: siteName.get(zone.siteId) ?? "",
      benches: summaries.get(zone.id) ?? [],
    }));
  }
}
