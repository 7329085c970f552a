import { existsSync } from "node:fs";
import { join } from "node:path";
import express, { type Express } from "express";
import helmet from "helmet";
import type { DataSource } from "typeorm";
import { apiNotFound, createErrorHandler } from "./lib/error-handler.js";
import type { Logger } from "./lib/logger.js";
import type { Metrics } from "./lib/metrics.js";
import { healthRoutes } from "./modules/health/health.routes.js";
import { readingsRoutes } from "./modules/readings/readings.routes.js";
import type { ReadingsService } from "./modules/readings/readings.service.js";
import type { LiveHub } from "./modules/stream/live-hub.js";
import { streamRoutes } from "./modules/stream/stream.routes.js";
import { zonesRoutes } from "./modules/zones/zones.routes.js";
import type { ZonesService } from "./modules/zones/zones.service.js";

export interface AppDeps {
  dataSource: DataSource;
  zones: ZonesService;
  readings: ReadingsService;
  hub: LiveHub;
  metrics: Metrics;
  logger: Logger;
  /** Folder of the built client (vite build); served with a fallback to index.html for client routes. */
  staticDir?: string;
}

/** The Express app with every route, no listen(): tests drive it with supertest. */
export function createApp(deps: AppDeps): Express {
  const app = express();
  app.disable("x-powered-by");
  app.set("trust proxy", "loopback");
  app.use(
    helmet({
      contentSecurityPolicy: {
        directives: {
          // recharts sets inline style attributes on its SVG.
          "style-src": ["'self'", "'unsafe-inline'"],
          "img-src": ["'self'", "data:", "blob:"],
          // Plain HTTP on a greenhouse LAN is common; do not force https sub-resources.
          "upgrade-insecure-requests": null,
        },
      },
      // Same reason: HSTS over plain HTTP on a LAN would lock tablets out.
      strictTransportSecurity: false,
    }),
  );
  app.use(express.json({ limit: "100kb" }));

  app.use(healthRoutes(deps.dataSource, deps.metrics));
  app.use("/api", zonesRoutes(deps.zones), readingsRoutes(deps.readings), streamRoutes(deps.hub));
  app.use("/api", apiNotFound);

  const staticDir = deps.staticDir;
  if (staticDir && existsSync(join(staticDir, "index.html"))) {
    app.use(express.static(staticDir, { index: false, maxAge: "1h" }));
    app.get("/{*path}", (_req, res) => res.sendFile(join(staticDir, "index.html")));
  }

  app.use(createErrorHandler(deps.logger));
  return app;
}
