import { EntitySchema } from "typeorm";
import type { WindowedQuantity } from "../../../shared/schemas/quantities.js";
import type { Bench } from "./bench.entity.js";
import type { Zone } from "./zone.entity.js";

/** One quantity's rooting window, in stored units. Zone windows and bench overrides share the shape. */
export interface WindowLimit {
  quantity: WindowedQuantity;
  minValue: number;
  maxValue: number;
  delayS: number;
  hysteresis: number;
}

export interface ZoneWindow extends WindowLimit {
  zoneId: number;
  zone?: Zone;
}

export interface BenchWindow extends WindowLimit {
  benchId: number;
  bench?: Bench;
}

const limitColumns = {
  quantity: { type: "varchar", length: 32, primary: true },
  minValue: { type: "real", name: "min_value" },
  maxValue: { type: "real", name: "max_value" },
  delayS: { type: "integer", name: "delay_s" },
  hysteresis: { type: "real" },
} as const;

export const ZoneWindowEntity = new EntitySchema<ZoneWindow>({
  name: "ZoneWindow",
  tableName: "zone_window",
  columns: { zoneId: { type: "integer", name: "zone_id", primary: true }, ...limitColumns },
  relations: { zone: { type: "many-to-one", target: "Zone", joinColumn: { name: "zone_id" }, onDelete: "CASCADE" } },
});

export const BenchWindowEntity = new EntitySchema<BenchWindow>({
  name: "BenchWindow",
  tableName: "bench_window",
  columns: { benchId: { type: "integer", name: "bench_id", primary: true }, ...limitColumns },
  relations: { bench: { type: "many-to-one", target: "Bench", joinColumn: { name: "bench_id" }, onDelete: "CASCADE" } },
});
