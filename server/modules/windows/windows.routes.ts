import { Router } from "express";
import { z } from "zod";
import type { Role } from "../../../shared/schemas/auth.js";
import {
  applyBenchPresetInputSchema,
  applyZonePresetInputSchema,
  benchWindowsInputSchema,
  dryRunQuerySchema,
  updateWindowPresetInputSchema,
  windowPresetInputSchema,
  zoneWindowsInputSchema,
} from "../../../shared/schemas/windows.js";
import { EVERYONE_SIGNED_IN, type RouteTable } from "../../lib/auth.js";
import type { WindowSettingsService } from "./window-settings.service.js";
import { rowIdParamSchema } from "../../../shared/schemas/ids.js";

/** Windows, bench overrides, margins and presets are the manager's (PRODUCT.md §3), and the admin's. */
export const WINDOW_EDITORS: readonly Role[] = ["admin", "manager"];

const idParams = z.object({ id: rowIdParamSchema });
const presetParams = z.object({ id: z.string().min(1).max(40) });

export function windowsRoutes(table: RouteTable, settings: WindowSettingsService): Router {
  const r = table.router("/api", Router());
  const dryRun = (query: unknown) => dryRunQuerySchema.parse(query).dryRun;

  r.get("/zones/:id/windows", EVERYONE_SIGNED_IN, async (req, res) => {
    res.json(await settings.zoneWindows(idParams.parse(req.params).id));
  });
  r.put("/zones/:id/windows", WINDOW_EDITORS, async (req, res) => {
    const { id } = idParams.parse(req.params);
    res.json(await settings.saveZoneWindows(id, zoneWindowsInputSchema.parse(req.body), req.principal!, { dryRun: dryRun(req.query) }));
  });
  r.post("/zones/:id/windows/preset", WINDOW_EDITORS, async (req, res) => {
    const { id } = idParams.parse(req.params);
    res.json(await settings.applyPresetToZone(id, applyZonePresetInputSchema.parse(req.body), req.principal!, { dryRun: dryRun(req.query) }));
  });

  r.get("/benches/:id/windows", EVERYONE_SIGNED_IN, async (req, res) => {
    res.json(await settings.benchWindows(idParams.parse(req.params).id));
  });
  r.put("/benches/:id/windows", WINDOW_EDITORS, async (req, res) => {
    const { id } = idParams.parse(req.params);
    res.json(await settings.saveBenchWindows(id, benchWindowsInputSchema.parse(req.body), req.principal!, { dryRun: dryRun(req.query) }));
  });
  r.post("/benches/:id/windows/preset", WINDOW_EDITORS, async (req, res) => {
    const { id } = idParams.parse(req.params);
    res.json(await settings.applyPresetToBench(id, applyBenchPresetInputSchema.parse(req.body), req.principal!, { dryRun: dryRun(req.query) }));
  });

  r.get("/window-presets", EVERYONE_SIGNED_IN, async (_req, res) => {
    res.json({ presets: await settings.listPresets() });
  });
  r.post("/window-presets", WINDOW_EDITORS, async (req, res) => {
    const answer = await settings.createPreset(windowPresetInputSchema.parse(req.body), req.principal!, { dryRun: dryRun(req.query) });
    res.status(answer.dryRun ? 200 : 201).json(answer);
  });
  r.patch("/window-presets/:id", WINDOW_EDITORS, async (req, res) => {
    const { id } = presetParams.parse(req.params);
    res.json(await settings.updatePreset(id, updateWindowPresetInputSchema.parse(req.body), req.principal!, { dryRun: dryRun(req.query) }));
  });
  r.delete("/window-presets/:id", WINDOW_EDITORS, async (req, res) => {
    await settings.deletePreset(presetParams.parse(req.params).id, req.principal!);
    res.status(204).end();
  });

  return r.router;
}
