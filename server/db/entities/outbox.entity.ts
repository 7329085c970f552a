import { EntitySchema } from "typeorm";

/**
 * Every e-mail is written here first and sent by the outbox worker, with retries. The message id
 * is fixed when the row is written and reused on every attempt, so a receiver can drop a repeat.
 */
export interface OutboxRecord {
  id: number;
  messageId: string;
  toAddress: string;
  subject: string;
  text: string;
  html: string | null;
  createdAtMs: number;
  attempts: number;
  nextAttemptMs: number;
  sentAtMs: number | null;
  lastError: string | null;
}

export const OutboxEntity = new EntitySchema<OutboxRecord>({
  name: "Outbox",
  tableName: "outbox",
  columns: {
    id: { type: "integer", primary: true, generated: "increment" },
    messageId: { type: "varchar", name: "message_id", length: 200, unique: true },
    toAddress: { type: "varchar", name: "to_address", length: 254 },
    subject: { type: "varchar", length: 300 },
    text: { type: "text" },
    html: { type: "text", nullable: true },
    createdAtMs: { type: "integer", name: "created_at_ms" },
    attempts: { type: "integer", default: 0 },
    nextAttemptMs: { type: "integer", name: "next_attempt_ms" },
    sentAtMs: { type: "integer", name: "sent_at_ms", nullable: true },
    lastError: { type: "varchar", name: "last_error", length: 500, nullable: true },
  },
  indices: [{ name: "idx_outbox_due", columns: ["sentAtMs", "nextAttemptMs"] }],
});
