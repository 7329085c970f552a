import type { DataSource } from "typeorm";
import type { Quantity } from "../../../shared/schemas/quantities.js";
import type { SeriesPoint } from "../../../shared/schemas/readings.js";
import { isPostgres, postgresPool, rawDatabase } from "../../db/data-source.js";
import { PostgresReadingsRepository } from "./postgres-readings.repository.js";
import { ReadingsRepository, type LatestRow, type ReadingRow } from "./readings.repository.js";

/** Stored readings as the server uses them, on SQLite or PostgreSQL alike. */
export interface ReadingStore {
  /**
   * Store a batch in one transaction; resolves after the commit with the rows that were new, in
   * the order given (a re-sent reading is stored once and counted in latest and rollups once).
   */
  insertReadings(rows: ReadingRow[]): Promise<ReadingRow[]>;
  /** Rebuild rollup hours a back-dated probe move made stale; series() does it itself, exports call it first. */
  refreshStaleRollups(): Promise<void>;
  /** min/mean/max per bucket of bucketMs from fromMs over [fromMs, toMs), for one bench and quantity. */
  series(benchId: number, quantity: Quantity, fromMs: number, toMs: number, bucketMs: number): Promise<SeriesPoint[]>;
  /** What series() gives for each bench and quantity, read at once; pairs without readings are absent. */
  seriesOfBenches(benchIds: readonly number[], quantities: readonly Quantity[], fromMs: number, toMs: number, bucketMs: number): Promise<Map<number, Map<Quantity, SeriesPoint[]>>>;
  /** The newest reading per sensor and quantity, for every sensor on a bench. */
  latestOnBenches(): Promise<LatestRow[]>;
}

/**
 * The SQLite repository behind the async interface. Its work stays synchronous inside (one
 * better-sqlite3 transaction per call, done before the promise is returned), so the ingest hot
 * path costs what it did; tests that write readings directly keep using ReadingsRepository.
 */
export class SqliteReadingStore implements ReadingStore {
  constructor(readonly repository: ReadingsRepository) {}

  async insertReadings(rows: ReadingRow[]): Promise<ReadingRow[]> {
    return this.repository.insertReadings(rows);
  }

  async refreshStaleRollups(): Promise<void> {
    this.repository.refreshStaleRollups();
  }

  async series(benchId: number, quantity: Quantity, fromMs: number, toMs: number, bucketMs: number): Promise<SeriesPoint[]> {
    return this.repository.series(benchId, quantity, fromMs, toMs, bucketMs);
  }

  async seriesOfBenches(benchIds: readonly number[], quantities: readonly Quantity[], fromMs: number, toMs: number, bucketMs: number): Promise<Map<number, Map<Quantity, SeriesPoint[]>>> {
    return this.repository.seriesOfBenches(benchIds, quantities, fromMs, toMs, bucketMs);
  }

  async latestOnBenches(): Promise<LatestRow[]> {
    return this.repository.latestOnBenches();
  }
}

/** The readings store of the data source's database. */
export function createReadingStore(dataSource: DataSource): ReadingStore {
  return isPostgres(dataSource) ? new PostgresReadingsRepository(postgresPool(dataSource)) : new SqliteReadingStore(new ReadingsRepository(rawDatabase(dataSource)));
}
