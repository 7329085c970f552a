import { In, IsNull, Not, type DataSource, type FindOptionsWhere } from "typeorm";
import type { AckLinkResponse, AlertsQuery, AlertView } from "../../../shared/schemas/alerts.js";
import { verifyAckLink } from "../../alerts/ack-links.js";
import { toAlertView } from "../../alerts/alert-views.js";
import type { AlertEngine } from "../../alerts/engine.js";
import type { LayoutCache } from "../../alerts/layout-cache.js";
import { AlertEntity, type AlertRecord } from "../../db/entities/alert.entity.js";
import { UserEntity } from "../../db/entities/user.entity.js";
import { AppError, notFound } from "../../lib/errors.js";
import type { WindowsService } from "../windows/windows.service.js";

export class AlertsService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly engine: AlertEngine,
    private readonly layout: LayoutCache,
    private readonly windows: WindowsService,
    private readonly secret: string,
  ) {}

  private view(a: AlertRecord): AlertView {
    return toAlertView(a, this.layout, this.windows);
  }

  async list(query: AlertsQuery): Promise<AlertView[]> {
    const where: FindOptionsWhere<AlertRecord> = {};
    if (query.phase) where.phase = query.phase;
    else if (query.status === "open") where.phase = In(["watching", "raised", "acknowledged"]);
    else if (query.status === "past") where.phase = "cleared";
    if (query.zoneId) where.zoneId = query.zoneId;
    if (query.kind) where.kind = query.kind;
    if (query.benchId) where.benchId = query.benchId;
    await this.layout.reload();
    let rows = await this.dataSource.getRepository(AlertEntity).find({ where, order: { sinceMs: "DESC", id: "DESC" }, take: query.fromMs !== undefined || query.toMs !== undefined ? 5000 : query.limit });
    // Open at some moment of the range: began before its end, and not cleared before its start.
    if (query.toMs !== undefined) rows = rows.filter((a) => a.sinceMs < query.toMs!);
    if (query.fromMs !== undefined) rows = rows.filter((a) => a.clearedAtMs === null || a.clearedAtMs >= query.fromMs!);
    return rows.slice(0, query.limit).map((a) => this.view(a));
  }

  async get(id: number): Promise<AlertView> {
    const row = await this.dataSource.getRepository(AlertEntity).findOneBy({ id });
    if (!row) throw notFound("alert-not-found", `There is no alert ${id}`);
    await this.layout.reload();
    return this.view(row);
  }

  async views(ids: number[]): Promise<AlertView[]> {
    if (ids.length === 0) return [];
    const rows = await this.dataSource.getRepository(AlertEntity).find({ where: { id: In(ids) }, order: { id: "ASC" } });
    return rows.map((a) => this.view(a));
  }

  async acknowledge(id: number, userId: number, note?: string): Promise<AlertView> {
    const user = await this.dataSource.getRepository(UserEntity).findOneByOrFail({ id: userId });
    return this.view(await this.engine.acknowledge(id, { id: user.id, name: user.name }, note));
  }

  /** Open (not cleared) alerts per bench, for the dashboard. */
  async openByBench(): Promise<Map<number, AlertView[]>> {
    const rows = await this.dataSource.getRepository(AlertEntity).find({ where: { clearedAtMs: IsNull(), phase: Not("cleared") }, order: { sinceMs: "ASC", id: "ASC" } });
    const byBench = new Map<number, AlertView[]>();
    for (const r of rows) byBench.set(r.benchId, [...(byBench.get(r.benchId) ?? []), this.view(r)]);
    return byBench;
  }

  // ── e-mailed acknowledge links ───────────────────────────────────────────

  private async link(token: string) {
    const link = verifyAckLink(token, this.secret);
    const user = link ? await this.dataSource.getRepository(UserEntity).findOneBy({ id: link.userId }) : null;
    if (!link || !user || user.disabled) throw new AppError("link-not-valid", "This acknowledge link has expired or is not valid. Open the dashboard to acknowledge.", 410);
    return { link, user };
  }

  /** What the acknowledge page shows. Changes nothing: mail scanners open links too. */
  async describeLink(token: string): Promise<AckLinkResponse> {
    const { link, user } = await this.link(token);
    await this.layout.reload();
    const alerts = await this.views(link.alertIds);
    return { recipientName: user.name, recipientUnit: user.temperatureUnit, expiresAtMs: link.expiresAtMs, alerts, canAcknowledge: alerts.some((a) => a.phase === "raised") };
  }

  /** One tap: acknowledge every still-raised alert of the link as its recipient. */
  async acknowledgeWithLink(token: string, note?: string): Promise<AckLinkResponse> {
    const { link, user } = await this.link(token);
    const before = await this.views(link.alertIds);
    const raised = before.filter((a) => a.phase === "raised");
    if (raised.length === 0) {
      const done = before.find((a) => a.acknowledgedByName);
      throw new AppError(
        "already-acknowledged",
        done ? `Already acknowledged by ${done.acknowledgedByName}` : "Nothing left to acknowledge: these alerts have cleared",
        410,
      );
    }
    for (const a of raised) await this.engine.acknowledge(a.id, { id: user.id, name: user.name }, note).catch(() => undefined);
    return { recipientName: user.name, recipientUnit: user.temperatureUnit, expiresAtMs: link.expiresAtMs, alerts: await this.views(link.alertIds), canAcknowledge: false };
  }
}
