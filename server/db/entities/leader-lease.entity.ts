import { EntitySchema } from "typeorm";

/**
 * Which server instance holds a duty only one may run at a time (the alert engine with the mail
 * outbox), until when. Another instance takes the row over once `expiresAtMs` has passed; `term`
 * counts the hand-overs.
 */
export interface LeaderLease {
  name: string;
  holder: string;
  expiresAtMs: number;
  term: number;
}

export const LeaderLeaseEntity = new EntitySchema<LeaderLease>({
  name: "LeaderLease",
  tableName: "leader_lease",
  columns: {
    name: { type: "varchar", primary: true, length: 160 },
    holder: { type: "varchar", length: 200 },
    expiresAtMs: { type: "integer", name: "expires_at_ms" },
    term: { type: "integer" },
  },
});
