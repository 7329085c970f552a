import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { OutboxEntity } from "../../server/db/entities/outbox.entity.js";
import { createLogger } from "../../server/lib/logger.js";
import { Metrics } from "../../server/lib/metrics.js";
import { createSmtpTransport } from "../../server/mail/mailer.js";
import { MAX_SUBJECT_CHARS, Outbox } from "../../server/mail/outbox.js";
import { startPostgres, type Postgres } from "../support/postgres.js";
import { nameOf, twinDatabases, type TwinDatabases } from "../support/twin-databases.js";

/** The outbox writes the same rows on both databases, whatever the subject's length. */
let server: Postgres;
let twins: TwinDatabases;

beforeAll(async () => {
  server = await startPostgres();
  twins = await twinDatabases(server);
}, 120_000);

afterAll(async () => {
  await twins?.destroy();
  await server?.cleanup();
});

describe("the outbox on either database", () => {
  it("a subject longer than its column (long zone, bench and sensor names) is cut with an ellipsis, not refused", async () => {
    // A sensor-silent reminder with every name at its longest: 17 + 120 + 2 + 120 + 2 + 71 characters.
    const subject = `NOT ACKNOWLEDGED ${"Z".repeat(120)}, ${"B".repeat(120)}: sensor ${"s".repeat(64)} silent`;
    expect([...subject].length).toBeGreaterThan(MAX_SUBJECT_CHARS);
    const logger = createLogger("silent");
    for (const ds of twins.both) {
      // The worker is never started: nothing is sent, the transport only has to exist.
      const transport = createSmtpTransport({ smtpUrl: "smtp://127.0.0.1:9", from: "benchwarden@nursery.test", logger });
      const outbox = new Outbox(ds, transport, logger, new Metrics(), { pollMs: 60_000, domain: "benchwarden.test" });
      await outbox.enqueue({ to: "manager@nursery.test", subject, text: "…" });
      await outbox.enqueue({ to: "manager@nursery.test", subject: "All clear: House 1 · Fig cuttings, Bench 2 back in window", text: "…" });
      const stored = (await ds.getRepository(OutboxEntity).find({ order: { id: "ASC" } })).map((m) => m.subject);
      expect(stored, nameOf(ds)).toEqual([`${subject.slice(0, MAX_SUBJECT_CHARS - 1)}…`, "All clear: House 1 · Fig cuttings, Bench 2 back in window"]);
      await outbox.stop();
      transport.close();
    }
  });
});
