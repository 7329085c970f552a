import type { AlertView } from "../../../../shared/schemas/alerts.js";
import { WINDOWED_QUANTITIES, type WindowedQuantity } from "../../../../shared/schemas/quantities.js";
import type { ChartMarker } from "../../../features/readings/components/reading-chart";

const CONDENSATION_QUANTITIES: readonly WindowedQuantity[] = ["air.temperature", "air.humidity"];

/**
 * Where each alert of the range is marked: a window alert on its own quantity's chart, a
 * condensation risk on the air temperature and humidity charts, a silent sensor on all four.
 * Alerts never raised (still watching) are left out. On a zone's charts each label names its
 * bench ("Bench 2 · Air too cold").
 */
export function alertMarkers(alerts: readonly AlertView[], { withBench }: { withBench: boolean }): Partial<Record<WindowedQuantity, ChartMarker[]>> {
  const byQuantity: Partial<Record<WindowedQuantity, ChartMarker[]>> = {};
  const add = (q: WindowedQuantity, m: ChartMarker) => (byQuantity[q] = [...(byQuantity[q] ?? []), m]);
  for (const a of alerts) {
    if (a.raisedAtMs === null) continue;
    const marker = { timeMs: a.raisedAtMs, label: withBench ? `${a.benchName} · ${a.summary}` : a.summary };
    if (a.kind === "window" && a.quantity) add(a.quantity as WindowedQuantity, marker);
    else if (a.kind === "condensation") CONDENSATION_QUANTITIES.forEach((q) => add(q, marker));
    else WINDOWED_QUANTITIES.forEach((q) => add(q, marker));
  }
  return byQuantity;
}
