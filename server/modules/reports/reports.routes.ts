import { Router, type Response } from "express";
import { batchesCsvQuerySchema, observationsCsvQuerySchema, reportQuerySchema, type StrikeRateReport } from "../../../shared/schemas/batches.js";
import { EVERYONE_SIGNED_IN, type RouteTable } from "../../lib/auth.js";
import type { CsvFile, ReportsService } from "./reports.service.js";

function sendCsv(res: Response, file: CsvFile): void {
  res.status(200);
  res.setHeader("Content-Type", "text/csv; charset=utf-8");
  res.setHeader("Content-Disposition", `attachment; filename="${file.filename}"`);
  res.setHeader("Cache-Control", "no-store");
  res.send(file.text);
}

/** Strike-rate reports and batch/observation CSVs: every signed-in role reads them (a viewer sees everything). */
export function reportsRoutes(table: RouteTable, reports: ReportsService): Router {
  const r = table.router("/api", Router());

  r.get("/reports/strike-rates", EVERYONE_SIGNED_IN, async (req, res) => {
    const body: StrikeRateReport = await reports.strikeRates(reportQuerySchema.parse(req.query));
    res.json(body);
  });
  r.get("/exports/batches.csv", EVERYONE_SIGNED_IN, async (req, res) => {
    sendCsv(res, await reports.batchesCsv(batchesCsvQuerySchema.parse(req.query)));
  });
  r.get("/exports/observations.csv", EVERYONE_SIGNED_IN, async (req, res) => {
    sendCsv(res, await reports.observationsCsv(observationsCsvQuerySchema.parse(req.query)));
  });

  return r.router;
}
