import { localDate } from "../../../../shared/domain/batch-calendar.js";
import type { LayoutResponse } from "../../../../shared/schemas/layout.js";
import type { BenchGroup } from "../../../features/batches/components/bench-options";

/** The benches in use, grouped by zone in walking order, for the batch forms. */
export function benchGroupsOf(layout: LayoutResponse): BenchGroup[] {
  return layout.zones
    .filter((z) => z.archivedAtMs === null)
    .map((z) => ({
      zoneId: z.id,
      zoneName: z.name,
      benches: layout.benches.filter((b) => b.zoneId === z.id && b.archivedAtMs === null).map((b) => ({ id: b.id, name: b.name })),
    }))
    .filter((g) => g.benches.length > 0);
}

/** Today in the (first) site's time zone: batches are dated on the nursery's calendar. */
export function siteToday(layout: LayoutResponse, siteId?: number): string {
  const site = layout.sites.find((s) => s.id === siteId) ?? layout.sites.find((s) => s.archivedAtMs === null) ?? layout.sites[0];
  return localDate(Date.now(), site?.timeZone ?? "UTC");
}
