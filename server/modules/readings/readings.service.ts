import type { DataSource } from "typeorm";
import { QUANTITIES } from "../../../shared/schemas/quantities.js";
import { MAX_SERIES_POINTS, type BenchReadingsResponse, type SeriesQuery } from "../../../shared/schemas/readings.js";
import { BenchEntity } from "../../db/entities/bench.entity.js";
import { ZoneEntity } from "../../db/entities/zone.entity.js";
import { badRequest, notFound } from "../../lib/errors.js";
import type { WindowsService } from "../windows/windows.service.js";
import type { ReadingsRepository } from "./readings.repository.js";

const DAY_MS = 24 * 3600 * 1000;
/** The longest range one request may ask for: a season's chart, still cut into MAX_SERIES_POINTS buckets. */
const MAX_RANGE_MS = 400 * DAY_MS;
/** Buckets are whole minutes at least, so a short range does not split into empty slivers. */
const MIN_BUCKET_MS = 60_000;

export class ReadingsService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly repository: ReadingsRepository,
    private readonly windows: WindowsService,
    private readonly now: () => number = Date.now,
  ) {}

  async benchSeries(benchId: number, query: SeriesQuery): Promise<BenchReadingsResponse> {
    const bench = await this.dataSource.getRepository(BenchEntity).findOneBy({ id: benchId });
    if (!bench) throw notFound("bench-not-found", `There is no bench ${benchId}`);
    const zone = await this.dataSource.getRepository(ZoneEntity).findOneBy({ id: bench.zoneId });

    const toMs = query.to?.getTime() ?? this.now();
    const fromMs = query.from?.getTime() ?? toMs - DAY_MS;
    if (toMs - fromMs > MAX_RANGE_MS) throw badRequest("range-too-long", "Ask for at most 400 days at a time");
    const bucketMs = Math.max(MIN_BUCKET_MS, Math.ceil((toMs - fromMs) / MAX_SERIES_POINTS / MIN_BUCKET_MS) * MIN_BUCKET_MS);

    const quantities = query.quantity ? [query.quantity] : QUANTITIES;
    return {
      bench: { id: bench.id, name: bench.name, zoneId: bench.zoneId, zoneName: zone?.name ?? "" },
      fromMs,
      toMs,
      bucketMs,
      windows: await this.windows.windowsOf(bench.id),
      series: quantities.map((quantity) => ({
        quantity,
        points: this.repository.series(bench.id, quantity, fromMs, toMs, bucketMs),
      })),
    };
  }
}
