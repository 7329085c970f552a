import { dirname, join, resolve } from "node:path";
import type { DataSource } from "typeorm";
import { rawDatabase } from "../../db/data-source.js";
import type { Logger } from "../../lib/logger.js";
import type { Mailer } from "../../mail/outbox.js";
import type { AlertsService } from "../alerts/alerts.service.js";
import { ObservationsService } from "../observations/observations.service.js";
import { PhotosService } from "../photos/photos.service.js";
import { BenchEnvironment } from "../reports/bench-environment.js";
import { ReportsService } from "../reports/reports.service.js";
import { RoundsService } from "../rounds/rounds.service.js";
import type { WindowsService } from "../windows/windows.service.js";
import { BatchesService } from "./batches.service.js";

/** The services of issue 6 (batches, observations, photos, walk-throughs, reports), built together. */
export interface PropagationServices {
  batches: BatchesService;
  observations: ObservationsService;
  photos: PhotosService;
  rounds: RoundsService;
  reports: ReportsService;
}

export interface PropagationDeps {
  dataSource: DataSource;
  windows: WindowsService;
  alerts: AlertsService;
  mailer: Mailer;
  logger: Logger;
  /** DATABASE_PATH: photos live in a "photos" folder beside the database file. */
  databasePath: string;
  /** A silence longer than this counts as no data in time-in-window (SENSOR_SILENT_AFTER). */
  silentAfterMs: number;
  appUrl: () => string;
  now?: () => number;
}

/** The folder photos are stored in: `<folder of the database>/photos`. */
export function photoDirFor(databasePath: string): string {
  return join(dirname(resolve(databasePath)), "photos");
}

export function createPropagation(deps: PropagationDeps): PropagationServices {
  const now = deps.now ?? Date.now;
  const environment = new BenchEnvironment(rawDatabase(deps.dataSource), deps.silentAfterMs);
  const batches = new BatchesService(deps.dataSource, now);
  const photos = new PhotosService(deps.dataSource, photoDirFor(deps.databasePath), now);
  const observations = new ObservationsService(deps.dataSource, batches, photos, now);
  const rounds = new RoundsService(
    deps.dataSource,
    { batches, observations, alerts: deps.alerts, windows: deps.windows, environment, mailer: deps.mailer, appUrl: deps.appUrl, logger: deps.logger },
    now,
  );
  const reports = new ReportsService(deps.dataSource, batches, deps.windows, environment, now);
  return { batches, observations, photos, rounds, reports };
}
