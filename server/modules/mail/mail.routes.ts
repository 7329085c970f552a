import { Router } from "express";
import type { DataSource } from "typeorm";
import type { CaughtMail } from "../../../shared/schemas/mail.js";
import { CaughtMailEntity } from "../../db/entities/caught-mail.entity.js";
import { ADMIN_ONLY, type RouteTable } from "../../lib/auth.js";

/** GET /api/mail: what the local SMTP sink caught, newest first (demo mode; empty with a real relay). */
export function mailRoutes(table: RouteTable, dataSource: DataSource): Router {
  const r = table.router("/api", Router());
  r.get("/mail", ADMIN_ONLY, async (_req, res) => {
    const rows = await dataSource.getRepository(CaughtMailEntity).find({ order: { id: "DESC" }, take: 200 });
    const messages: CaughtMail[] = rows.map((m) => ({
      id: m.id,
      receivedAtMs: m.receivedAtMs,
      from: m.from,
      to: JSON.parse(m.to) as string[],
      subject: m.subject,
      text: m.text,
    }));
    res.json({ messages });
  });
  return r.router;
}
