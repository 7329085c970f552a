import { In, IsNull, type DataSource } from "typeorm";
import { usersOnDuty } from "../../shared/domain/duty-rota.js";
import { AlertEntity, AlertNoticeEntity, DutyShiftEntity, type AlertNoticeRecord, type NoticeType } from "../db/entities/alert.entity.js";
import { UserEntity, type UserRecord } from "../db/entities/user.entity.js";
import type { Logger } from "../lib/logger.js";
import type { Mailer } from "../mail/outbox.js";
import type { WindowsService } from "../modules/windows/windows.service.js";
import { signAckLink } from "./ack-links.js";
import { toAlertView } from "./alert-views.js";
import type { LayoutCache } from "./layout-cache.js";
import { composeMessage } from "./messages.js";

export interface NotifierConfig {
  groupWindowMs: number;
  ackLinkLifetimeMs: number;
  secret: string;
  appUrl: () => string;
}

/**
 * Turns waiting notices into e-mail. Notices of one zone and one kind that arrive within the
 * grouping interval become ONE message per recipient, so a house-wide heater failure is one mail.
 * The outbox rows and the "queued" marks commit together: a crash sends nothing twice.
 */
export class Notifier {
  constructor(
    private readonly dataSource: DataSource,
    private readonly layout: LayoutCache,
    private readonly windows: WindowsService,
    private readonly mailer: Mailer,
    private readonly logger: Logger,
    private readonly config: NotifierConfig,
    private readonly now: () => number,
  ) {}

  private async managers(): Promise<UserRecord[]> {
    const users = await this.dataSource.getRepository(UserEntity).find({ where: { disabled: false }, order: { id: "ASC" } });
    const managers = users.filter((u) => u.role === "manager");
    return managers.length > 0 ? managers : users.filter((u) => u.role === "admin");
  }

  /** The people on duty for a zone now; the managers when the rota covers nobody. */
  private async onDuty(zoneId: number, nowMs: number): Promise<{ users: UserRecord[]; fromRota: boolean }> {
    const shifts = await this.dataSource.getRepository(DutyShiftEntity).find();
    const ids = usersOnDuty(shifts, zoneId, nowMs, this.layout.timeZoneOfZone(zoneId));
    const users = ids.length ? await this.dataSource.getRepository(UserEntity).find({ where: { id: In(ids), disabled: false }, order: { id: "ASC" } }) : [];
    return users.length > 0 ? { users, fromRota: true } : { users: await this.managers(), fromRota: false };
  }

  private chain: Promise<unknown> = Promise.resolve();

  /**
   * Queue e-mail for every group whose grouping interval has passed. Runs one at a time: two
   * overlapping flushes would both see the same waiting notices and mail them twice.
   */
  flush(): Promise<number> {
    const run = this.chain.then(() => this.flushOnce());
    this.chain = run.catch(() => undefined);
    return run;
  }

  private async flushOnce(): Promise<number> {
    const nowMs = this.now();
    const waiting = await this.dataSource.getRepository(AlertNoticeEntity).find({ where: { queuedAtMs: IsNull() }, order: { id: "ASC" } });
    const groups = new Map<string, AlertNoticeRecord[]>();
    for (const n of waiting) {
      const key = `${n.zoneId}:${n.type === "reminder" ? "raised" : n.type}`;
      groups.set(key, [...(groups.get(key) ?? []), n]);
    }
    let queued = 0;
    for (const notices of groups.values()) {
      const first = notices[0]!;
      if (nowMs - first.createdAtMs < this.config.groupWindowMs) continue;
      queued += await this.queueGroup(first.zoneId, first.type, notices, nowMs);
    }
    return queued;
  }

  private async queueGroup(zoneId: number, type: NoticeType, notices: AlertNoticeRecord[], nowMs: number): Promise<number> {
    await this.layout.reload();
    const ids = [...new Set(notices.map((n) => n.alertId))];
    const rows = await this.dataSource.getRepository(AlertEntity).find({ where: { id: In(ids) }, order: { sinceMs: "ASC", id: "ASC" } });
    // Tell only what is still true: an alert acknowledged or cleared while its group waited is left out.
    const relevant = rows.filter((a) => (type === "cleared" ? a.phase === "cleared" : a.phase === "raised"));
    const alerts = relevant.map((a) => toAlertView(a, this.layout, this.windows));
    const zone = this.layout.zones.get(zoneId);
    const site = this.layout.siteOfZone(zoneId);

    let recipients: UserRecord[];
    let reason: string;
    if (type === "escalation") {
      recipients = await this.managers();
      reason = "you are a manager and nobody on duty acknowledged in time";
    } else {
      const duty = await this.onDuty(zoneId, nowMs);
      recipients = duty.users;
      reason = duty.fromRota ? `you are on duty for ${zone?.name ?? "this zone"}` : "nobody on the duty rota covers this time, so the managers are told";
      if (type === "cleared" && rows.some((a) => a.escalatedAtMs !== null)) {
        for (const m of await this.managers()) if (!recipients.some((r) => r.id === m.id)) recipients.push(m);
      }
    }

    let sent = 0;
    await this.dataSource.transaction(async (tx) => {
      if (alerts.length > 0) {
        for (const user of recipients) {
          const ackUrl = type === "cleared" ? null : `${this.config.appUrl()}/ack?token=${encodeURIComponent(signAckLink(alerts.map((a) => a.id), user.id, this.config.secret, this.config.ackLinkLifetimeMs))}`;
          const message = composeMessage({
            type,
            recipient: { name: user.name, unit: user.temperatureUnit },
            zoneName: zone?.name ?? "",
            siteName: site?.name ?? "",
            timeZone: site?.timeZone ?? "UTC",
            alerts,
            ackUrl,
            appUrl: this.config.appUrl(),
            nowMs,
            reason,
          });
          await this.mailer.enqueue({ to: user.email, subject: message.subject, text: message.text, html: message.html }, tx);
          sent++;
        }
      }
      await tx.getRepository(AlertNoticeEntity).update({ id: In(notices.map((n) => n.id)) }, { queuedAtMs: nowMs });
    });
    if (alerts.length > 0 && recipients.length === 0) this.logger.error({ zoneId, type }, "alert with nobody to tell: no manager or admin is active");
    return sent;
  }
}
