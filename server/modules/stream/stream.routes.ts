import { Router } from "express";
import type { LiveHub } from "./live-hub.js";

export function streamRoutes(hub: LiveHub): Router {
  const router = Router();
  router.get("/stream", (_req, res) => hub.attach(res));
  return router;
}
