import type { NextFunction, Request, RequestHandler, Response, Router } from "express";
import jwt from "jsonwebtoken";
import type { Role } from "../../shared/schemas/auth.js";
import { AppError } from "./errors.js";

export const SESSION_COOKIE = "bw_session";

/** Who is asking, as the guard found them. */
export interface Principal {
  userId: number;
  role: Role;
}

declare module "express-serve-static-core" {
  interface Request {
    principal?: Principal;
  }
}

interface SessionClaims {
  sub: string;
  pwv: number;
  purpose: "session";
}

export function signSessionToken(user: { id: number; passwordVersion: number }, secret: string, hours: number): { token: string; expiresAtMs: number } {
  const token = jwt.sign({ pwv: user.passwordVersion, purpose: "session" }, secret, {
    subject: String(user.id),
    expiresIn: Math.round(hours * 3600),
    algorithm: "HS256",
  });
  const { exp } = jwt.decode(token) as { exp: number };
  return { token, expiresAtMs: exp * 1000 };
}

/** A valid session's claims, or null for anything else (wrong secret, expired, another purpose). */
export function verifySessionToken(token: string, secret: string): { userId: number; passwordVersion: number; expiresAtMs: number } | null {
  try {
    const claims = jwt.verify(token, secret, { algorithms: ["HS256"] }) as SessionClaims & { exp: number };
    if (claims.purpose !== "session" || !/^\d+$/.test(claims.sub)) return null;
    return { userId: Number(claims.sub), passwordVersion: claims.pwv, expiresAtMs: claims.exp * 1000 };
  } catch {
    return null;
  }
}

export function tokenFromRequest(req: Request): string | undefined {
  const header = req.headers.authorization;
  if (header?.startsWith("Bearer ")) return header.slice(7).trim();
  const cookie = (req.cookies as Record<string, string> | undefined)?.[SESSION_COOKIE];
  return cookie || undefined;
}

/** Who may call a route: anyone, or the listed roles. */
export type Access = "public" | readonly Role[];

export interface RouteRule {
  method: string;
  path: string;
  access: Access;
}

type Method = "get" | "post" | "put" | "patch" | "delete";

/**
 * Every route is declared with its access rule, so the rule cannot be forgotten: the guard runs
 * before the handler, and the rules are listed for the role-matrix test.
 */
export class RouteTable {
  readonly rules: RouteRule[] = [];

  constructor(private readonly identify: (req: Request) => Promise<Principal | null>) {}

  /** Wraps a Router (mounted at the root) so its get/post/… take the access rule as their second argument. */
  router(prefix: string, router: Router) {
    const add =
      (method: Method) =>
      (path: string, access: Access, ...handlers: RequestHandler[]) => {
        this.rules.push({ method: method.toUpperCase(), path: prefix + path, access });
        router[method](prefix + path, this.guard(access), ...handlers);
      };
    return { router, get: add("get"), post: add("post"), put: add("put"), patch: add("patch"), delete: add("delete") };
  }

  guard(access: Access): RequestHandler {
    return (req: Request, _res: Response, next: NextFunction) => {
      if (access === "public") return next();
      this.identify(req).then((principal) => {
        if (!principal) return next(new AppError("sign-in-required", "Sign in to continue", 401));
        if (!access.includes(principal.role)) {
          return next(new AppError("forbidden", `Your role (${principal.role}) may not do this`, 403));
        }
        req.principal = principal;
        next();
      }, next);
    };
  }
}

export const EVERYONE_SIGNED_IN: readonly Role[] = ["admin", "manager", "grower", "viewer"];
export const ADMIN_ONLY: readonly Role[] = ["admin"];
