import { Router, type Response } from "express";
import { readingsExportQuerySchema } from "../../../shared/schemas/exports.js";
import { EVERYONE_SIGNED_IN, type RouteTable } from "../../lib/auth.js";
import type { ExportsService } from "./exports.service.js";

/** Waits until the response can take more, or the client has gone (then false). */
function drained(res: Response): Promise<boolean> {
  return new Promise((resolve) => {
    const done = (ok: boolean) => () => {
      res.off("drain", onDrain);
      res.off("close", onClose);
      resolve(ok);
    };
    const onDrain = done(true);
    const onClose = done(false);
    res.once("drain", onDrain);
    res.once("close", onClose);
  });
}

/** CSV exports: reading data, so every signed-in role may take one (a viewer sees everything). */
export function exportsRoutes(table: RouteTable, exportsService: ExportsService): Router {
  const r = table.router("/api", Router());

  r.get("/exports/readings.csv", EVERYONE_SIGNED_IN, async (req, res) => {
    const file = await exportsService.readingsCsv(readingsExportQuerySchema.parse(req.query));
    res.status(200);
    res.setHeader("Content-Type", "text/csv; charset=utf-8");
    res.setHeader("Content-Disposition", `attachment; filename="${file.filename}"`);
    res.setHeader("Cache-Control", "no-store");
    for await (const chunk of file.chunks) {
      if (!res.write(chunk) && !(await drained(res))) return;
    }
    res.end();
  });

  return r.router;
}
