import { EntitySchema } from "typeorm";

/** A message caught by the local SMTP sink (the stand-in for a mail relay in demo mode and tests). */
export interface CaughtMailRecord {
  id: number;
  receivedAtMs: number;
  from: string;
  /** JSON array of recipient addresses. */
  to: string;
  subject: string;
  text: string;
  raw: string;
}

export const CaughtMailEntity = new EntitySchema<CaughtMailRecord>({
  name: "CaughtMail",
  tableName: "caught_mail",
  columns: {
    id: { type: "integer", primary: true, generated: "increment" },
    receivedAtMs: { type: "integer", name: "received_at_ms" },
    from: { type: "varchar", name: "from_address", length: 320 },
    to: { type: "text", name: "to_addresses" },
    subject: { type: "varchar", length: 500 },
    text: { type: "text" },
    raw: { type: "text" },
  },
});
