import type { DataSource } from "typeorm";
import { LeaderLeaseEntity } from "../db/entities/leader-lease.entity.js";
import type { Logger } from "../lib/logger.js";
import type { DrainedSession } from "../mqtt/external-broker.js";
import { databaseNowSql } from "./lease.js";

/** The lease each instance holds on its own broker session while it is alive. */
export const sessionLeaseName = (clientId: string) => `mqtt-session:${clientId}`;
const PREFIX = "mqtt-session:";
/** How long a drain may take before another instance may try again. */
const DRAIN_CLAIM_MS = 10 * 60_000;

/**
 * Run by the instance holding the alert lease: finds broker sessions whose instance stopped
 * renewing its session lease (it died, or was stopped) and drains them (drainSession), so that
 * instance's share of the readings is stored now rather than when it returns. A session is
 * claimed with a conditional UPDATE first, so two instances never drain the same one.
 */
export class SessionReaper {
  private sweeping: Promise<void> | null = null;

  constructor(
    private readonly dataSource: DataSource,
    private readonly instanceId: string,
    private readonly drain: (clientId: string) => Promise<DrainedSession>,
    private readonly logger: Logger,
  ) {}

  private stopped = false;

  /** Wait for a drain in progress and start no other. */
  async stop(): Promise<void> {
    this.stopped = true;
    await this.sweeping;
  }

  sweep(): Promise<void> {
    if (this.stopped) return Promise.resolve();
    return (this.sweeping ??= this.sweepOnce()
      .catch((err: unknown) => this.logger.error({ err }, "draining the sessions of stopped instances failed"))
      .finally(() => (this.sweeping = null)));
  }

  private async sweepOnce(): Promise<void> {
    const now = databaseNowSql(this.dataSource);
    const expired = await this.dataSource
      .getRepository(LeaderLeaseEntity)
      .createQueryBuilder("l")
      .where(`l.name LIKE :prefix AND l.holder <> '' AND l.expires_at_ms < ${now}`, { prefix: `${PREFIX}%` })
      .getMany();
    for (const lease of expired) {
      if (this.stopped) return;
      const drainer = `drain:${this.instanceId}`;
      const claimed = await this.dataSource
        .createQueryBuilder()
        .update(LeaderLeaseEntity)
        .set({ holder: drainer, expiresAtMs: () => `${now} + ${DRAIN_CLAIM_MS}` })
        .where(`name = :name AND holder <> '' AND expires_at_ms < ${now}`, { name: lease.name })
        .execute();
      if (!claimed.affected) continue;
      const clientId = lease.name.slice(PREFIX.length);
      let retry = true;
      try {
        const result = await this.drain(clientId);
        retry = !result.ended && !result.takenBack;
        this.logger.warn(
          { clientId, stoppedInstance: lease.holder, ...result },
          result.takenBack
            ? "a stopped instance came back while its MQTT session was drained; it has its session again"
            : "drained the MQTT session of a stopped instance: its share of the readings now goes to the running instances",
        );
      } finally {
        // Free the row: the instance takes it back when it returns; until then nobody drains it
        // again, unless this drain could not finish (then the next sweep tries once more).
        await this.dataSource
          .createQueryBuilder()
          .update(LeaderLeaseEntity)
          .set({ holder: retry ? lease.holder : "", expiresAtMs: 0 })
          .where("name = :name AND holder = :drainer", { name: lease.name, drainer })
          .execute();
      }
    }
  }
}
