import { EntitySchema } from "typeorm";
import type { BatchStage } from "../../../shared/domain/batch.js";
import type { BatchRecord } from "./batch.entity.js";

/**
 * What a grower saw on a batch on a date. `clientId` is the device's UUID for it: unique, so a
 * re-sent observation is stored once. Counts are running totals ("so far"). Flags are
 * comma-separated words. `roundId` is the walk-through it was recorded in, if any.
 */
export interface ObservationRecord {
  id: number;
  clientId: string;
  batchId: number;
  roundId: number | null;
  /** "YYYY-MM-DD", site-local. */
  observedOn: string;
  stage: BatchStage;
  rootedCount: number | null;
  lostCount: number | null;
  flags: string;
  note: string | null;
  recordedAtMs: number;
  recordedByUserId: number | null;
  recordedByName: string;
  updatedAtMs: number;
  batch?: BatchRecord;
}

export const ObservationEntity = new EntitySchema<ObservationRecord>({
  name: "Observation",
  tableName: "observation",
  columns: {
    id: { type: "integer", primary: true, generated: "increment" },
    clientId: { type: "varchar", name: "client_id", length: 36, unique: true },
    batchId: { type: "integer", name: "batch_id" },
    roundId: { type: "integer", name: "round_id", nullable: true },
    observedOn: { type: "varchar", name: "observed_on", length: 10 },
    stage: { type: "varchar", length: 16 },
    rootedCount: { type: "integer", name: "rooted_count", nullable: true },
    lostCount: { type: "integer", name: "lost_count", nullable: true },
    flags: { type: "varchar", length: 120, default: "" },
    note: { type: "text", nullable: true },
    recordedAtMs: { type: "integer", name: "recorded_at_ms" },
    recordedByUserId: { type: "integer", name: "recorded_by_user_id", nullable: true },
    recordedByName: { type: "varchar", name: "recorded_by_name", length: 80 },
    updatedAtMs: { type: "integer", name: "updated_at_ms" },
  },
  relations: {
    batch: { type: "many-to-one", target: "Batch", joinColumn: { name: "batch_id" }, onDelete: "CASCADE" },
  },
  indices: [
    { name: "idx_observation_batch_date", columns: ["batchId", "observedOn"] },
    { name: "idx_observation_round", columns: ["roundId"] },
    { name: "idx_observation_recorded", columns: ["recordedAtMs"] },
  ],
});

/**
 * A photo of an observation, stored under the photo folder beside the database with generated
 * names (never the client's). `sha256` is of the uploaded bytes: the same image sent again to the
 * same observation is stored once.
 */
export interface ObservationPhotoRecord {
  id: number;
  observationId: number;
  fileName: string;
  thumbnailFileName: string;
  width: number;
  height: number;
  bytes: number;
  thumbnailWidth: number;
  thumbnailHeight: number;
  sha256: string;
  uploadedAtMs: number;
  uploadedByUserId: number | null;
  uploadedByName: string;
  observation?: ObservationRecord;
}

export const ObservationPhotoEntity = new EntitySchema<ObservationPhotoRecord>({
  name: "ObservationPhoto",
  tableName: "observation_photo",
  columns: {
    id: { type: "integer", primary: true, generated: "increment" },
    observationId: { type: "integer", name: "observation_id" },
    fileName: { type: "varchar", name: "file_name", length: 64 },
    thumbnailFileName: { type: "varchar", name: "thumbnail_file_name", length: 64 },
    width: { type: "integer" },
    height: { type: "integer" },
    bytes: { type: "integer" },
    thumbnailWidth: { type: "integer", name: "thumbnail_width" },
    thumbnailHeight: { type: "integer", name: "thumbnail_height" },
    sha256: { type: "varchar", length: 64 },
    uploadedAtMs: { type: "integer", name: "uploaded_at_ms" },
    uploadedByUserId: { type: "integer", name: "uploaded_by_user_id", nullable: true },
    uploadedByName: { type: "varchar", name: "uploaded_by_name", length: 80 },
  },
  relations: {
    observation: { type: "many-to-one", target: "Observation", joinColumn: { name: "observation_id" }, onDelete: "CASCADE" },
  },
  indices: [{ name: "idx_observation_photo_sha", columns: ["observationId", "sha256"], unique: true }],
});
