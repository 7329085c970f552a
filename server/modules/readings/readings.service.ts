import { IsNull, type DataSource } from "typeorm";
import { QUANTITIES } from "../../../shared/schemas/quantities.js";
import { MAX_SERIES_POINTS, type BenchReadingsResponse, type SeriesQuery, type ZoneReadingsResponse } from "../../../shared/schemas/readings.js";
import { BenchEntity } from "../../db/entities/bench.entity.js";
import { SiteEntity } from "../../db/entities/site.entity.js";
import { ZoneEntity } from "../../db/entities/zone.entity.js";
import { badRequest, notFound } from "../../lib/errors.js";
import type { WindowsService } from "../windows/windows.service.js";
import type { ReadingStore } from "./reading-store.js";

const DAY_MS = 24 * 3600 * 1000;
/** The longest range one request may ask for: a season's chart, still cut into MAX_SERIES_POINTS buckets. */
const MAX_RANGE_MS = 400 * DAY_MS;
/** Buckets are whole minutes at least, so a short range does not split into empty slivers. */
const MIN_BUCKET_MS = 60_000;
/**
 * Bucket sizes a series is cut into (minutes): the smallest that keeps it within MAX_SERIES_POINTS.
 * Each is a multiple of a rollup resolution (1 min, 15 min, 1 h), so long ranges read rollups.
 */
const BUCKET_MINUTES = [1, 2, 3, 5, 10, 15, 30, 60, 120, 180, 360, 720, 1440];

export function bucketSizeMs(rangeMs: number): number {
  const wantedMs = Math.max(MIN_BUCKET_MS, Math.ceil(rangeMs / MAX_SERIES_POINTS / MIN_BUCKET_MS) * MIN_BUCKET_MS);
  const nice = BUCKET_MINUTES.map((m) => m * MIN_BUCKET_MS).find((b) => b >= wantedMs);
  return nice ?? Math.ceil(wantedMs / DAY_MS) * DAY_MS;
}

export class ReadingsService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly repository: ReadingStore,
    private readonly windows: WindowsService,
    private readonly now: () => number = Date.now,
  ) {}

  /** The range asked for, checked, with its bucket width. */
  private range(query: SeriesQuery): { fromMs: number; toMs: number; bucketMs: number } {
    const toMs = query.to?.getTime() ?? this.now();
    const fromMs = query.from?.getTime() ?? toMs - DAY_MS;
    if (toMs - fromMs > MAX_RANGE_MS) throw badRequest("range-too-long", "Ask for at most 400 days at a time");
    return { fromMs, toMs, bucketMs: bucketSizeMs(toMs - fromMs) };
  }

  async benchSeries(benchId: number, query: SeriesQuery): Promise<BenchReadingsResponse> {
    const bench = await this.dataSource.getRepository(BenchEntity).findOneBy({ id: benchId });
    if (!bench) throw notFound("bench-not-found", `There is no bench ${benchId}`);
    const zone = await this.dataSource.getRepository(ZoneEntity).findOneBy({ id: bench.zoneId });
    const { fromMs, toMs, bucketMs } = this.range(query);

    const quantities = query.quantity ? [query.quantity] : QUANTITIES;
    return {
      bench: { id: bench.id, name: bench.name, zoneId: bench.zoneId, zoneName: zone?.name ?? "" },
      fromMs,
      toMs,
      bucketMs,
      windows: await this.windows.windowsOf(bench.id),
      series: await Promise.all(
        quantities.map(async (quantity) => ({
          quantity,
          points: await this.repository.series(bench.id, quantity, fromMs, toMs, bucketMs),
        })),
      ),
    };
  }

  /**
   * Every bench in use of a zone (walking order) over one range, each as benchSeries answers it,
   * read in one statement from the rollups: the zone chart's one request.
   */
  async zoneSeries(zoneId: number, query: SeriesQuery): Promise<ZoneReadingsResponse> {
    const zone = await this.dataSource.getRepository(ZoneEntity).findOneBy({ id: zoneId });
    if (!zone) throw notFound("zone-not-found", `There is no zone ${zoneId}`);
    const site = await this.dataSource.getRepository(SiteEntity).findOneBy({ id: zone.siteId });
    const benches = await this.dataSource.getRepository(BenchEntity).find({ where: { zoneId, archivedAtMs: IsNull() }, order: { position: "ASC", id: "ASC" } });
    const { fromMs, toMs, bucketMs } = this.range(query);

    const quantities = query.quantity ? [query.quantity] : [...QUANTITIES];
    const series = await this.repository.seriesOfBenches(
      benches.map((b) => b.id),
      quantities,
      fromMs,
      toMs,
      bucketMs,
    );
    return {
      zone: { id: zone.id, name: zone.name, siteName: site?.name ?? "" },
      fromMs,
      toMs,
      bucketMs,
      benches: await Promise.all(
        benches.map(async (bench) => ({
          bench: { id: bench.id, name: bench.name, zoneId: zone.id, zoneName: zone.name },
          fromMs,
          toMs,
          bucketMs,
          windows: await this.windows.windowsOf(bench.id),
          series: quantities.map((quantity) => ({ quantity, points: series.get(bench.id)?.get(quantity) ?? [] })),
        })),
      ),
    };
  }
}
