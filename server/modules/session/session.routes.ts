import { Router, type Request, type Response } from "express";
import { signInInputSchema, updateMeInputSchema, type SessionResponse } from "../../../shared/schemas/auth.js";
import { EVERYONE_SIGNED_IN, SESSION_COOKIE, signSessionToken, tokenFromRequest, verifySessionToken, type RouteTable } from "../../lib/auth.js";
import { AppError } from "../../lib/errors.js";
import { toUserView, type UsersService } from "../users/users.service.js";

export interface SessionOptions {
  secret: string;
  sessionHours: number;
  demo: boolean;
}

function setSessionCookie(req: Request, res: Response, token: string, hours: number): void {
  res.cookie(SESSION_COOKIE, token, {
    httpOnly: true,
    sameSite: "strict",
    secure: req.secure,
    path: "/",
    maxAge: hours * 3600 * 1000,
  });
}

/** POST/GET/DELETE /api/session (PRODUCT.md §4) and PATCH /api/me. */
export function sessionRoutes(table: RouteTable, users: UsersService, options: SessionOptions): Router {
  const r = table.router("/api", Router());

  r.post("/session", "public", async (req, res) => {
    const input = signInInputSchema.parse(req.body);
    const user = await users.signIn(input.email, input.password, req.ip ?? "unknown");
    const { token, expiresAtMs } = signSessionToken(user, options.secret, options.sessionHours);
    setSessionCookie(req, res, token, options.sessionHours);
    const body: SessionResponse = { user: toUserView(user), expiresAtMs, demo: options.demo };
    res.json(body);
  });

  r.get("/session", EVERYONE_SIGNED_IN, async (req, res) => {
    const user = await users.findActive(req.principal!.userId);
    if (!user) throw new AppError("sign-in-required", "Sign in to continue", 401);
    const claims = verifySessionToken(tokenFromRequest(req)!, options.secret)!;
    const body: SessionResponse = { user: toUserView(user), expiresAtMs: claims.expiresAtMs, demo: options.demo };
    res.json(body);
  });

  r.delete("/session", "public", (req, res) => {
    res.clearCookie(SESSION_COOKIE, { httpOnly: true, sameSite: "strict", secure: req.secure, path: "/" });
    res.status(204).end();
  });

  r.patch("/me", EVERYONE_SIGNED_IN, async (req, res) => {
    res.json({ user: await users.updateMe(req.principal!.userId, updateMeInputSchema.parse(req.body)) });
  });

  return r.router;
}
