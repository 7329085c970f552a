import { existsSync } from "node:fs";
import { join } from "node:path";
import { constants as zlibConstants } from "node:zlib";
import cookieParser from "cookie-parser";
import express, { type Express } from "express";
import compression from "compression";
import helmet from "helmet";
import type { DataSource } from "typeorm";
import { RouteTable, tokenFromRequest, verifySessionToken, type Principal } from "./lib/auth.js";
import { refuseCrossSite } from "./lib/cross-site.js";
import { apiNotFound, createErrorHandler } from "./lib/error-handler.js";
import type { Logger } from "./lib/logger.js";
import type { Metrics } from "./lib/metrics.js";
import { alertsRoutes } from "./modules/alerts/alerts.routes.js";
import { actorContext } from "./modules/audit/actor-context.js";
import { auditRoutes } from "./modules/audit/audit.routes.js";
import type { AuditService } from "./modules/audit/audit.service.js";
import { exportsRoutes } from "./modules/exports/exports.routes.js";
import type { ExportsService } from "./modules/exports/exports.service.js";
import { layoutRoutes } from "./modules/layout/layout.routes.js";
import type { LayoutService } from "./modules/layout/layout.service.js";
import type { AlertsService } from "./modules/alerts/alerts.service.js";
import { healthRoutes } from "./modules/health/health.routes.js";
import { mailRoutes } from "./modules/mail/mail.routes.js";
import { readingsRoutes } from "./modules/readings/readings.routes.js";
import { rotaRoutes } from "./modules/rota/rota.routes.js";
import type { RotaService } from "./modules/rota/rota.service.js";
import type { ReadingsService } from "./modules/readings/readings.service.js";
import { sensorsRoutes } from "./modules/sensors/sensors.routes.js";
import type { SensorsService } from "./modules/sensors/sensors.service.js";
import { sessionRoutes } from "./modules/session/session.routes.js";
import type { LiveHub } from "./modules/stream/live-hub.js";
import { streamRoutes } from "./modules/stream/stream.routes.js";
import { usersRoutes } from "./modules/users/users.routes.js";
import type { UsersService } from "./modules/users/users.service.js";
import type { WindowSettingsService } from "./modules/windows/window-settings.service.js";
import { windowsRoutes } from "./modules/windows/windows.routes.js";
import { zonesRoutes } from "./modules/zones/zones.routes.js";
import { batchesRoutes } from "./modules/batches/batches.routes.js";
import type { PropagationServices } from "./modules/batches/propagation.js";
import { observationsRoutes } from "./modules/observations/observations.routes.js";
import { photosRoutes } from "./modules/photos/photos.routes.js";
import { reportsRoutes } from "./modules/reports/reports.routes.js";
import { roundsRoutes } from "./modules/rounds/rounds.routes.js";
import type { ZonesService } from "./modules/zones/zones.service.js";

export interface AppDeps extends PropagationServices {
  dataSource: DataSource;
  zones: ZonesService;
  readings: ReadingsService;
  users: UsersService;
  sensors: SensorsService;
  alerts: AlertsService;
  rota: RotaService;
  layout: LayoutService;
  windowSettings: WindowSettingsService;
  audit: AuditService;
  exports: ExportsService;
  hub: LiveHub;
  metrics: Metrics;
  logger: Logger;
  /** For /healthz: "ok" when the MQTT side is up, else what is wrong. */
  brokerStatus?: () => string;
  jwtSecret: string;
  sessionHours: number;
  demo: boolean;
  /** Folder of the built client (vite build); served with a fallback to index.html for client routes. */
  staticDir?: string;
}

/** The Express app with every route, no listen(): tests drive it with supertest. */
export function createApp(deps: AppDeps): Express & { locals: { routeTable: RouteTable } } {
  const app = express();
  app.disable("x-powered-by");
  app.set("trust proxy", "loopback");
  app.use(
    helmet({
      contentSecurityPolicy: {
        directives: {
          // Only our own origin: fonts are shipped, nothing is fetched elsewhere. recharts sets inline styles.
          "default-src": ["'self'"],
          "style-src": ["'self'", "'unsafe-inline'"],
          "img-src": ["'self'", "data:", "blob:"],
          "font-src": ["'self'"],
          "connect-src": ["'self'"],
          // Plain HTTP on a greenhouse LAN is common; do not force https sub-resources.
          "upgrade-insecure-requests": null,
        },
      },
      // Same reason: HSTS over plain HTTP on a LAN would lock tablets out.
      strictTransportSecurity: false,
    }),
  );
  // A zone's month of series is most of a megabyte of JSON: gzip it for tablets on greenhouse
  // Wi-Fi, at the fastest level (a third of the size for half the CPU of the default level,
  // measured on series JSON). The live stream says Cache-Control: no-transform, which keeps it
  // uncompressed (its events must leave as soon as they are written).
  app.use(compression({ level: zlibConstants.Z_BEST_SPEED }));
  app.use("/api", refuseCrossSite);
  app.use(express.json({ limit: "100kb" }));
  app.use(cookieParser());

  // Who is asking: a valid session token for an active user whose password has not changed since.
  const identify = async (req: express.Request): Promise<Principal | null> => {
    const token = tokenFromRequest(req);
    const claims = token ? verifySessionToken(token, deps.jwtSecret) : null;
    if (!claims) return null;
    const user = await deps.users.findActive(claims.userId);
    if (!user || user.passwordVersion !== claims.passwordVersion) return null;
    return { userId: user.id, role: user.role };
  };
  const table = new RouteTable(identify);
  app.locals.routeTable = table;

  // Services that audit a change find the signed-in principal through this (modules/audit/actor-context.ts).
  app.use(actorContext());
  app.use(healthRoutes(table, deps.dataSource, deps.metrics, deps.brokerStatus ?? (() => "ok")));
  app.use(sessionRoutes(table, deps.users, { secret: deps.jwtSecret, sessionHours: deps.sessionHours, demo: deps.demo }));
  app.use(usersRoutes(table, deps.users));
  app.use(sensorsRoutes(table, deps.sensors));
  app.use(mailRoutes(table, deps.dataSource));
  app.use(zonesRoutes(table, deps.zones));
  app.use(readingsRoutes(table, deps.readings));
  app.use(streamRoutes(table, deps.hub));
  app.use(alertsRoutes(table, deps.alerts));
  app.use(rotaRoutes(table, deps.rota));
  app.use(layoutRoutes(table, deps.layout, deps.sensors));
  app.use(windowsRoutes(table, deps.windowSettings));
  app.use(auditRoutes(table, deps.audit));
  app.use(exportsRoutes(table, deps.exports));
  app.use(batchesRoutes(table, deps.batches));
  app.use(observationsRoutes(table, deps.observations));
  app.use(photosRoutes(table, deps.photos, deps.observations));
  app.use(roundsRoutes(table, deps.rounds));
  app.use(reportsRoutes(table, deps.reports));
  app.use("/api", apiNotFound);

  const staticDir = deps.staticDir;
  if (staticDir && existsSync(join(staticDir, "index.html"))) {
    app.use(express.static(staticDir, { index: false, maxAge: "1h" }));
    app.get("/{*path}", (_req, res) => res.sendFile(join(staticDir, "index.html")));
  }

  app.use(createErrorHandler(deps.logger));
  return app as Express & { locals: { routeTable: RouteTable } };
}
