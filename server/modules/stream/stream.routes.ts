import { Router } from "express";
import { EVERYONE_SIGNED_IN, type RouteTable } from "../../lib/auth.js";
import type { LiveHub } from "./live-hub.js";

export function streamRoutes(table: RouteTable, hub: LiveHub): Router {
  const r = table.router("/api", Router());
  r.get("/stream", EVERYONE_SIGNED_IN, (_req, res) => hub.attach(res));
  return r.router;
}
