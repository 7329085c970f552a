import { EntitySchema } from "typeorm";
import type { Bench } from "./bench.entity.js";
import type { Sensor } from "./sensor.entity.js";

/**
 * One stretch of time a sensor spent on a bench: [fromMs, toMs), toMs null while it is still
 * there. The open stretch always matches sensor.bench_id (SensorsService keeps them together).
 */
export interface SensorAssignmentRecord {
  id: number;
  sensorId: string;
  benchId: number;
  fromMs: number;
  toMs: number | null;
  sensor?: Sensor;
  bench?: Bench;
}

export const SensorAssignmentEntity = new EntitySchema<SensorAssignmentRecord>({
  name: "SensorAssignment",
  tableName: "sensor_assignment",
  columns: {
    id: { type: "integer", primary: true, generated: "increment" },
    sensorId: { type: "varchar", name: "sensor_id", length: 64 },
    benchId: { type: "integer", name: "bench_id" },
    fromMs: { type: "integer", name: "from_ms" },
    toMs: { type: "integer", name: "to_ms", nullable: true },
  },
  relations: {
    sensor: { type: "many-to-one", target: "Sensor", joinColumn: { name: "sensor_id" }, onDelete: "CASCADE" },
    bench: { type: "many-to-one", target: "Bench", joinColumn: { name: "bench_id" }, onDelete: "RESTRICT" },
  },
  indices: [
    { name: "idx_sensor_assignment_sensor", columns: ["sensorId", "fromMs"] },
    { name: "idx_sensor_assignment_bench", columns: ["benchId", "fromMs"] },
  ],
});
