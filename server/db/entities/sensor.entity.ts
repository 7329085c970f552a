import { EntitySchema } from "typeorm";
import type { Bench } from "./bench.entity.js";
import type { SensorKind } from "../../../shared/schemas/quantities.js";

export interface Sensor {
  /** The device id, also its MQTT user name. */
  id: string;
  kind: SensorKind;
  /** SHA-256 of the device secret (hex). Secrets are 32 random bytes, so a fast hash suffices. */
  secretHash: string;
  benchId: number | null;
  /** When an admin disabled it; a disabled sensor cannot sign in. */
  disabledAtMs: number | null;
  createdAtMs: number;
  /** JSON of shared/domain/calibration.ts's SensorCalibration, in stored units; "{}" = none. */
  calibration: string;
  bench?: Bench | null;
}

export const SensorEntity = new EntitySchema<Sensor>({
  name: "Sensor",
  tableName: "sensor",
  columns: {
    id: { type: "varchar", primary: true, length: 64 },
    kind: { type: "varchar", length: 16 },
    secretHash: { type: "varchar", name: "secret_hash", length: 64 },
    benchId: { type: "integer", name: "bench_id", nullable: true },
    disabledAtMs: { type: "integer", name: "disabled_at_ms", nullable: true },
    createdAtMs: { type: "integer", name: "created_at_ms" },
    calibration: { type: "text", default: "{}" },
  },
  relations: {
    bench: { type: "many-to-one", target: "Bench", joinColumn: { name: "bench_id" }, onDelete: "SET NULL", nullable: true },
  },
});
