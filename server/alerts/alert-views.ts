import { describeAlert } from "../../shared/domain/quantity-words.js";
import type { AlertView } from "../../shared/schemas/alerts.js";
import type { AlertRecord } from "../db/entities/alert.entity.js";
import type { WindowsService } from "../modules/windows/windows.service.js";
import type { LayoutCache } from "./layout-cache.js";

/** An alert row as the API and the e-mails show it. */
export function toAlertView(alert: AlertRecord, layout: LayoutCache, windows: WindowsService): AlertView {
  const bench = layout.benches.get(alert.benchId);
  const zone = layout.zones.get(alert.zoneId);
  const site = layout.siteOfZone(alert.zoneId);
  const window = alert.kind === "window" && alert.quantity ? windows.windowFor(alert.benchId, alert.quantity) : undefined;
  return {
    id: alert.id,
    kind: alert.kind,
    phase: alert.phase,
    benchId: alert.benchId,
    benchName: bench?.name ?? `Bench ${alert.benchId}`,
    zoneId: alert.zoneId,
    zoneName: zone?.name ?? "",
    siteName: site?.name ?? "",
    quantity: alert.quantity,
    direction: alert.direction,
    sensorId: alert.sensorId,
    lastValue: alert.lastValue,
    worstValue: alert.worstValue,
    windowMin: window?.min ?? null,
    windowMax: window?.max ?? null,
    sinceMs: alert.sinceMs,
    raisedAtMs: alert.raisedAtMs,
    acknowledgedAtMs: alert.acknowledgedAtMs,
    acknowledgedByName: alert.acknowledgedByName,
    acknowledgeNote: alert.acknowledgeNote,
    clearedAtMs: alert.clearedAtMs,
    escalatedAtMs: alert.escalatedAtMs,
    summary: describeAlert(alert),
  };
}
