import { EntitySchema } from "typeorm";
import type { Zone } from "./zone.entity.js";

export interface Bench {
  id: number;
  zoneId: number;
  name: string;
  /** Place in the walking order within the zone. */
  position: number;
  archivedAtMs: number | null;
  /** The bench's own dew-point margin, °C; null follows the zone's. */
  dewPointMarginC: number | null;
  zone?: Zone;
}

export const BenchEntity = new EntitySchema<Bench>({
  name: "Bench",
  tableName: "bench",
  columns: {
    id: { type: "integer", primary: true, generated: "increment" },
    zoneId: { type: "integer", name: "zone_id" },
    name: { type: "varchar", length: 120 },
    position: { type: "integer", default: 0 },
    archivedAtMs: { type: "integer", name: "archived_at_ms", nullable: true },
    dewPointMarginC: { type: "real", name: "dew_point_margin_c", nullable: true },
  },
  relations: {
    zone: { type: "many-to-one", target: "Zone", joinColumn: { name: "zone_id" }, onDelete: "RESTRICT" },
  },
});
