import { EntitySchema } from "typeorm";
import type { BatchOutcome, Wrapping } from "../../../shared/schemas/batches.js";
import type { Bench } from "./bench.entity.js";

/**
 * A batch of cuttings of one variety stuck on one date (PRODUCT.md §3). `benchId` is where it is
 * now (the open placement's bench, kept together by BatchesService). Lists are stored as
 * comma-separated words. Batches are never deleted.
 */
export interface BatchRecord {
  id: number;
  variety: string;
  woodSource: string | null;
  /** "YYYY-MM-DD", site-local. */
  stuckOn: string;
  countStuck: number;
  thicknessMm: number | null;
  budsAboveMedium: number | null;
  /** e.g. "scored,hormone"; "" for none. */
  baseTreatments: string;
  hormoneProduct: string | null;
  wrapping: Wrapping | null;
  notes: string | null;
  benchId: number;
  outcome: BatchOutcome | null;
  closedOn: string | null;
  closedAtMs: number | null;
  finalRooted: number | null;
  finalLost: number | null;
  closeNote: string | null;
  createdAtMs: number;
  createdByUserId: number | null;
  createdByName: string;
  updatedAtMs: number;
  bench?: Bench;
}

export const BatchEntity = new EntitySchema<BatchRecord>({
  name: "Batch",
  tableName: "batch",
  columns: {
    id: { type: "integer", primary: true, generated: "increment" },
    variety: { type: "varchar", length: 120 },
    woodSource: { type: "varchar", name: "wood_source", length: 200, nullable: true },
    stuckOn: { type: "varchar", name: "stuck_on", length: 10 },
    countStuck: { type: "integer", name: "count_stuck" },
    thicknessMm: { type: "real", name: "thickness_mm", nullable: true },
    budsAboveMedium: { type: "integer", name: "buds_above_medium", nullable: true },
    baseTreatments: { type: "varchar", name: "base_treatments", length: 64, default: "" },
    hormoneProduct: { type: "varchar", name: "hormone_product", length: 200, nullable: true },
    wrapping: { type: "varchar", length: 16, nullable: true },
    notes: { type: "text", nullable: true },
    benchId: { type: "integer", name: "bench_id" },
    outcome: { type: "varchar", length: 16, nullable: true },
    closedOn: { type: "varchar", name: "closed_on", length: 10, nullable: true },
    closedAtMs: { type: "integer", name: "closed_at_ms", nullable: true },
    finalRooted: { type: "integer", name: "final_rooted", nullable: true },
    finalLost: { type: "integer", name: "final_lost", nullable: true },
    closeNote: { type: "text", name: "close_note", nullable: true },
    createdAtMs: { type: "integer", name: "created_at_ms" },
    createdByUserId: { type: "integer", name: "created_by_user_id", nullable: true },
    createdByName: { type: "varchar", name: "created_by_name", length: 80 },
    updatedAtMs: { type: "integer", name: "updated_at_ms" },
  },
  relations: {
    bench: { type: "many-to-one", target: "Bench", joinColumn: { name: "bench_id" }, onDelete: "RESTRICT" },
  },
  indices: [
    { name: "idx_batch_bench_closed", columns: ["benchId", "closedAtMs"] },
    { name: "idx_batch_stuck_on", columns: ["stuckOn"] },
  ],
});

/** One stretch a batch spent on a bench: [fromMs, toMs), toMs null while it is there. */
export interface BatchPlacementRecord {
  id: number;
  batchId: number;
  benchId: number;
  fromMs: number;
  toMs: number | null;
  note: string | null;
  movedByUserId: number | null;
  movedByName: string | null;
  batch?: BatchRecord;
  bench?: Bench;
}

export const BatchPlacementEntity = new EntitySchema<BatchPlacementRecord>({
  name: "BatchPlacement",
  tableName: "batch_placement",
  columns: {
    id: { type: "integer", primary: true, generated: "increment" },
    batchId: { type: "integer", name: "batch_id" },
    benchId: { type: "integer", name: "bench_id" },
    fromMs: { type: "integer", name: "from_ms" },
    toMs: { type: "integer", name: "to_ms", nullable: true },
    note: { type: "varchar", length: 500, nullable: true },
    movedByUserId: { type: "integer", name: "moved_by_user_id", nullable: true },
    movedByName: { type: "varchar", name: "moved_by_name", length: 80, nullable: true },
  },
  relations: {
    batch: { type: "many-to-one", target: "Batch", joinColumn: { name: "batch_id" }, onDelete: "CASCADE" },
    bench: { type: "many-to-one", target: "Bench", joinColumn: { name: "bench_id" }, onDelete: "RESTRICT" },
  },
  indices: [
    { name: "idx_batch_placement_batch", columns: ["batchId", "fromMs"] },
    { name: "idx_batch_placement_bench", columns: ["benchId", "fromMs"] },
  ],
});
