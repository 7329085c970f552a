import { EntitySchema } from "typeorm";
import type { RoundStatus } from "../../../shared/schemas/rounds.js";
import type { Bench } from "./bench.entity.js";

/**
 * One walk-through: a zone, or every zone of a site (zoneId null). `scopeKey` ("zone:3", "site:1")
 * carries a partial unique index, so a scope has at most one round in progress. `summary` is the
 * JSON of RoundSummary (shared/schemas/rounds.ts), written when it finishes.
 */
export interface WalkRoundRecord {
  id: number;
  siteId: number;
  zoneId: number | null;
  scopeKey: string;
  status: RoundStatus;
  startedAtMs: number;
  startedByUserId: number | null;
  startedByName: string;
  finishedAtMs: number | null;
  finishedByUserId: number | null;
  finishedByName: string | null;
  summary: string | null;
}

export const WalkRoundEntity = new EntitySchema<WalkRoundRecord>({
  name: "WalkRound",
  tableName: "walk_round",
  columns: {
    id: { type: "integer", primary: true, generated: "increment" },
    siteId: { type: "integer", name: "site_id" },
    zoneId: { type: "integer", name: "zone_id", nullable: true },
    scopeKey: { type: "varchar", name: "scope_key", length: 32 },
    status: { type: "varchar", length: 16 },
    startedAtMs: { type: "integer", name: "started_at_ms" },
    startedByUserId: { type: "integer", name: "started_by_user_id", nullable: true },
    startedByName: { type: "varchar", name: "started_by_name", length: 80 },
    finishedAtMs: { type: "integer", name: "finished_at_ms", nullable: true },
    finishedByUserId: { type: "integer", name: "finished_by_user_id", nullable: true },
    finishedByName: { type: "varchar", name: "finished_by_name", length: 80, nullable: true },
    summary: { type: "text", nullable: true },
  },
  indices: [
    { name: "idx_walk_round_in_progress", columns: ["scopeKey"], unique: true, where: "status = 'in-progress'" },
    { name: "idx_walk_round_started", columns: ["siteId", "startedAtMs"] },
  ],
});

/**
 * A bench checked off in a round (a row exists only once checked). `card` is the JSON of what the
 * bench's card said at check-off (period, minutes out of window, extremes, alert ids) for the summary.
 */
export interface WalkRoundBenchRecord {
  id: number;
  roundId: number;
  benchId: number;
  checkedAtMs: number;
  checkedByUserId: number | null;
  checkedByName: string;
  note: string | null;
  card: string;
  round?: WalkRoundRecord;
  bench?: Bench;
}

export const WalkRoundBenchEntity = new EntitySchema<WalkRoundBenchRecord>({
  name: "WalkRoundBench",
  tableName: "walk_round_bench",
  columns: {
    id: { type: "integer", primary: true, generated: "increment" },
    roundId: { type: "integer", name: "round_id" },
    benchId: { type: "integer", name: "bench_id" },
    checkedAtMs: { type: "integer", name: "checked_at_ms" },
    checkedByUserId: { type: "integer", name: "checked_by_user_id", nullable: true },
    checkedByName: { type: "varchar", name: "checked_by_name", length: 80 },
    note: { type: "varchar", length: 1000, nullable: true },
    card: { type: "text" },
  },
  relations: {
    round: { type: "many-to-one", target: "WalkRound", joinColumn: { name: "round_id" }, onDelete: "CASCADE" },
    bench: { type: "many-to-one", target: "Bench", joinColumn: { name: "bench_id" }, onDelete: "RESTRICT" },
  },
  indices: [
    { name: "idx_walk_round_bench_unique", columns: ["roundId", "benchId"], unique: true },
    { name: "idx_walk_round_bench_bench", columns: ["benchId", "checkedAtMs"] },
  ],
});
