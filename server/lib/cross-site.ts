import type { RequestHandler } from "express";
import { AppError } from "./errors.js";

const SAFE_METHODS = new Set(["GET", "HEAD", "OPTIONS"]);

/**
 * CSRF posture, besides the SameSite=Strict session cookie: a state-changing API request must not
 * come from another site's page (its Origin, when the browser sends one, must be ours), and its
 * body must be JSON (or a multipart photo upload) — an HTML form on another site can send neither
 * with our cookie.
 */
export const refuseCrossSite: RequestHandler = (req, _res, next) => {
  if (SAFE_METHODS.has(req.method)) return next();
  const origin = req.headers.origin;
  if (origin && origin !== "null") {
    let host: string | null;
    try {
      host = new URL(origin).host;
    } catch {
      host = null;
    }
    if (host !== req.headers.host) return next(new AppError("cross-site-request", "Requests from another site are not accepted", 403));
  } else if (origin === "null") {
    return next(new AppError("cross-site-request", "Requests from an opaque origin are not accepted", 403));
  }
  const length = Number(req.headers["content-length"] ?? 0);
  const hasBody = length > 0 || req.headers["transfer-encoding"] !== undefined;
  if (hasBody && !req.is(["application/json", "application/*+json", "multipart/form-data"])) {
    return next(new AppError("unsupported-media-type", "Send JSON (Content-Type: application/json)", 415));
  }
  next();
};
