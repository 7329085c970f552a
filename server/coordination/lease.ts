import type { DataSource } from "typeorm";
import { isPostgres } from "../db/data-source.js";
import { LeaderLeaseEntity } from "../db/entities/leader-lease.entity.js";
import type { Logger } from "../lib/logger.js";

/** "Now" in epoch milliseconds as SQL: the database's clock on PostgreSQL (shared by all instances), this process's on SQLite (one instance). */
export function databaseNowSql(dataSource: DataSource): string {
  return isPostgres(dataSource) ? "(EXTRACT(EPOCH FROM clock_timestamp()) * 1000)::bigint" : String(Date.now());
}

export interface LeaseOptions {
  /** The duty's name (the row's key). */
  name: string;
  /** This instance, unique among the instances sharing the database. */
  holder: string;
  /** How long a renewal holds the lease: another instance takes over at most this long (plus one renewal) after the holder dies. */
  ttlMs: number;
  /** How often the holder renews and the others try to take over. */
  renewEveryMs: number;
}

/**
 * A lease row with an expiry: at most one instance holds it, and the holder renews it; when the
 * holder stops renewing (killed, cut off from the database) another instance takes it once it has
 * expired. On PostgreSQL the database's clock decides expiry, so instance clocks need not agree.
 *
 * The holder steps down by itself when it has not renewed for ttl − one renewal interval, before
 * anyone else may take over, so two instances never both believe they hold it (as long as a
 * renewal round trip stays under that interval).
 */
export class Lease {
  private timer: NodeJS.Timeout | null = null;
  private held = false;
  private renewedAtMs = 0;
  private round: Promise<void> = Promise.resolve();
  private stopped = false;
  private transitions: Promise<void> = Promise.resolve();

  constructor(
    private readonly dataSource: DataSource,
    private readonly options: LeaseOptions,
    private readonly logger: Logger,
    private readonly onAcquired: () => Promise<void>,
    private readonly onLost: () => Promise<void>,
  ) {}

  /** Whether this instance holds the lease now (renewed recently enough to be sure nobody else does). */
  isHeld(): boolean {
    return this.held && Date.now() - this.renewedAtMs < this.options.ttlMs - this.options.renewEveryMs;
  }

  /** Create the row if needed, try once (waiting for onAcquired when it is won), then keep trying. */
  async start(): Promise<void> {
    await this.dataSource
      .createQueryBuilder()
      .insert()
      .into(LeaderLeaseEntity)
      .values({ name: this.options.name, holder: "", expiresAtMs: 0, term: 0 })
      .orIgnore()
      .execute();
    await this.attempt();
    await this.transitions;
    this.timer = setInterval(() => void this.attempt(), this.options.renewEveryMs);
    this.timer.unref();
  }

  private attempt(): Promise<void> {
    this.round = this.round.then(async () => {
      if (this.stopped) return;
      // A failed round trip is not a loss: the holder keeps the duty until its renewal runs out.
      let won: boolean | null = null;
      try {
        won = await this.renew();
      } catch (err) {
        this.logger.warn({ err, lease: this.options.name }, "lease renewal failed");
      }
      if (won) this.renewedAtMs = Date.now();
      if (won && !this.held) this.change(true);
      else if (this.held && (won === false || !this.isHeld())) this.change(false);
    });
    return this.round;
  }

  /** One conditional UPDATE: take the row when it has expired, extend it when it is ours. */
  private async renew(): Promise<boolean> {
    const now = databaseNowSql(this.dataSource);
    const result = await this.dataSource
      .createQueryBuilder()
      .update(LeaderLeaseEntity)
      .set({
        holder: this.options.holder,
        expiresAtMs: () => `${now} + ${Math.round(this.options.ttlMs)}`,
        term: () => `CASE WHEN holder = :holder THEN term ELSE term + 1 END`,
      })
      .where(`name = :name AND (holder = :holder OR expires_at_ms < ${now})`, { name: this.options.name, holder: this.options.holder })
      .execute();
    return (result.affected ?? 0) > 0;
  }

  private change(held: boolean): void {
    this.held = held;
    this.logger.info({ lease: this.options.name, holder: this.options.holder }, held ? "took the lease: this instance runs the duty" : "lost the lease: another instance runs the duty");
    this.transitions = this.transitions
      .then(() => (held ? this.onAcquired() : this.onLost()))
      .catch((err: unknown) => this.logger.error({ err, lease: this.options.name }, "lease hand-over failed"));
  }

  /** Stop renewing; when held, stop the duty and release the row so another instance takes over at once. */
  async stop(): Promise<void> {
    this.stopped = true;
    if (this.timer) clearInterval(this.timer);
    await this.round;
    if (this.held) {
      this.change(false);
      await this.transitions;
      await this.dataSource
        .createQueryBuilder()
        .update(LeaderLeaseEntity)
        .set({ expiresAtMs: 0 })
        .where("name = :name AND holder = :holder", { name: this.options.name, holder: this.options.holder })
        .execute()
        .catch((err: unknown) => this.logger.warn({ err }, "could not release the lease; it expires by itself"));
    }
    await this.transitions;
  }
}
