import { AsyncLocalStorage } from "node:async_hooks";
import type { Request, RequestHandler } from "express";
import type { Principal } from "../../lib/auth.js";

const storage = new AsyncLocalStorage<{ req: Request }>();

/**
 * Keeps the request in reach of services that audit a change but are not handed the principal
 * by their route (the sensors routes). The route guard sets req.principal later in the same
 * request, so the principal is read when the change is recorded, not when the request arrives.
 * Mount before the routes.
 */
export function actorContext(): RequestHandler {
  return (req, _res, next) => storage.run({ req }, next);
}

/** The signed-in principal of the request being served, if any. */
export function currentActor(): Principal | null {
  return storage.getStore()?.req.principal ?? null;
}
