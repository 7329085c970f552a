import { dirname, join, resolve } from "node:path";
import type { DataSource } from "typeorm";
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
  /** Where observation photos are stored (PHOTOS_DIR, else a "photos" folder beside DATABASE_PATH). */
  photosDir: string;
  /** A silence longer than this counts as no data in time-in-window (SENSOR_SILENT_AFTER). */
  silentAfterMs: number;
  appUrl: () => string;
  now?: () => number;
}

/** The default folder for photos: `<folder of the database>/photos`. */
export function photoDirFor(databasePath: string): string {
  return join(dirname(resolve(databasePath)), "photos");
}

export function createPropagation(deps: PropagationDeps): PropagationServices {
  const now = deps.now ?? Date.now;
  const environment = new BenchEnvironment(deps.dataSource, deps.silentAfterMs);
  const batches = new BatchesService(deps.dataSource, now);
  const photos = new PhotosService(deps.dataSource, deps.photosDir, now);
  const observations = new ObservationsService(deps.dataSource, batches, photos, now);
  const rounds = new RoundsService(
    deps.dataSource,
    { batches, observations, alerts: deps.alerts, windows: deps.windows, environment, mailer: deps.mailer, appUrl: deps.appUrl, logger: deps.logger },
    now,
  );
  const reports = new ReportsService(deps.dataSource, batches, deps.windows, environment, now);
  return { batches, observations, photos, rounds, reports };
}
