import { EntitySchema } from "typeorm";
import type { Site } from "./site.entity.js";

export interface Zone {
  id: number;
  siteId: number;
  name: string;
  position: number;
  archivedAtMs: number | null;
  /** Air temperature minus dew point below which condensation risk is alerted, °C (default 2). */
  dewPointMarginC: number;
  site?: Site;
}

export const ZoneEntity = new EntitySchema<Zone>({
  name: "Zone",
  tableName: "zone",
  columns: {
    id: { type: "integer", primary: true, generated: "increment" },
    siteId: { type: "integer", name: "site_id" },
    name: { type: "varchar", length: 120 },
    position: { type: "integer", default: 0 },
    archivedAtMs: { type: "integer", name: "archived_at_ms", nullable: true },
    dewPointMarginC: { type: "real", name: "dew_point_margin_c", default: 2 },
  },
  relations: {
    site: { type: "many-to-one", target: "Site", joinColumn: { name: "site_id" }, onDelete: "RESTRICT" },
  },
});
