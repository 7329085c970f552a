import { Router } from "express";
import { z } from "zod";
import {
  inviteUserInputSchema,
  requestPasswordResetInputSchema,
  setPasswordInputSchema,
  updateUserInputSchema,
} from "../../../shared/schemas/auth.js";
import { ADMIN_ONLY, type RouteTable } from "../../lib/auth.js";
import type { UsersService } from "./users.service.js";
import { rowIdParamSchema } from "../../../shared/schemas/ids.js";

const idParams = z.object({ id: rowIdParamSchema });
const tokenParams = z.object({ token: z.string().min(10).max(2000) });

export function usersRoutes(table: RouteTable, users: UsersService): Router {
  const r = table.router("/api", Router());

  r.get("/users", ADMIN_ONLY, async (_req, res) => {
    res.json({ users: await users.list() });
  });

  r.post("/users", ADMIN_ONLY, async (req, res) => {
    const user = await users.invite(inviteUserInputSchema.parse(req.body), req.principal!.userId);
    res.status(201).json({ user });
  });

  r.patch("/users/:id", ADMIN_ONLY, async (req, res) => {
    const { id } = idParams.parse(req.params);
    res.json({ user: await users.update(id, updateUserInputSchema.parse(req.body), req.principal!.userId) });
  });

  // Same 202 for every address: the answer never tells whether an account exists.
  r.post("/password-resets", "public", async (req, res) => {
    const { email } = requestPasswordResetInputSchema.parse(req.body);
    await users.requestPasswordReset(email);
    res.status(202).json({ detail: "If that address has an account, a reset link is on its way." });
  });

  // Reading a link changes nothing (mail scanners follow links); only the POST sets the password.
  r.get("/password-links/:token", "public", async (req, res) => {
    res.json(await users.describeLink(tokenParams.parse(req.params).token));
  });

  r.post("/password-links/:token", "public", async (req, res) => {
    const { token } = tokenParams.parse(req.params);
    const { password } = setPasswordInputSchema.parse(req.body);
    const user = await users.setPasswordWithLink(token, password);
    res.json({ email: user.email, detail: "Password set. Sign in with it now." });
  });

  return r.router;
}
