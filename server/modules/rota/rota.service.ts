import { In, IsNull, type DataSource } from "typeorm";
import { usersOnDuty } from "../../../shared/domain/duty-rota.js";
import type { DutyRotaResponse, DutyShift, DutyShiftInput } from "../../../shared/schemas/alerts.js";
import { DutyShiftEntity, type DutyShiftRecord } from "../../db/entities/alert.entity.js";
import { SiteEntity } from "../../db/entities/site.entity.js";
import { UserEntity } from "../../db/entities/user.entity.js";
import { ZoneEntity } from "../../db/entities/zone.entity.js";
import { AppError, notFound } from "../../lib/errors.js";

/** The duty rota: who is mailed about which zone, when. */
export class RotaService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly now: () => number = Date.now,
  ) {}

  private async assertRefs(input: DutyShiftInput): Promise<void> {
    const user = await this.dataSource.getRepository(UserEntity).findOneBy({ id: input.userId });
    if (!user || user.disabled) throw new AppError("user-not-found", "Choose an active user", 400, [{ path: "userId", message: "Choose an active user" }]);
    if (user.role === "viewer") throw new AppError("viewer-cannot-be-on-duty", "A viewer cannot acknowledge, so cannot be on duty", 400, [{ path: "userId", message: "Viewers cannot acknowledge alerts" }]);
    if (input.zoneId !== null && !(await this.dataSource.getRepository(ZoneEntity).existsBy({ id: input.zoneId }))) {
      throw new AppError("zone-not-found", "Choose an existing zone", 400, [{ path: "zoneId", message: "Choose an existing zone" }]);
    }
  }

  private async views(rows: DutyShiftRecord[]): Promise<DutyShift[]> {
    const users = await this.dataSource.getRepository(UserEntity).find();
    const zones = await this.dataSource.getRepository(ZoneEntity).find();
    return rows.map((s) => ({
      ...s,
      zoneName: s.zoneId === null ? null : (zones.find((z) => z.id === s.zoneId)?.name ?? null),
      userName: users.find((u) => u.id === s.userId)?.name ?? "",
    }));
  }

  async rota(): Promise<DutyRotaResponse> {
    const shifts = await this.dataSource.getRepository(DutyShiftEntity).find({ order: { isFallback: "ASC", startMinute: "ASC" } });
    const zones = await this.dataSource.getRepository(ZoneEntity).find({ where: { archivedAtMs: IsNull() }, order: { position: "ASC" } });
    const site = await this.dataSource.getRepository(SiteEntity).findOne({ where: {}, order: { id: "ASC" } });
    const timeZone = site?.timeZone ?? "UTC";
    const users = await this.dataSource.getRepository(UserEntity).find({ where: { disabled: false } });
    const managers = users.filter((u) => u.role === "manager");
    const onDutyNow = zones.map((zone) => {
      const ids = usersOnDuty(shifts, zone.id, this.now(), timeZone);
      const chosen = ids.length ? users.filter((u) => ids.includes(u.id)) : managers;
      return { zoneId: zone.id, zoneName: zone.name, users: chosen.map((u) => ({ id: u.id, name: u.name })) };
    });
    return { shifts: await this.views(shifts), onDutyNow, timeZone };
  }

  /** Active users who can acknowledge, for the rota's person picker (managers cannot list users). */
  async candidates(): Promise<{ id: number; name: string; role: "admin" | "manager" | "grower" }[]> {
    const users = await this.dataSource.getRepository(UserEntity).find({ where: { disabled: false }, order: { name: "ASC" } });
    return users.flatMap((u) => (u.role === "viewer" ? [] : [{ id: u.id, name: u.name, role: u.role }]));
  }

  async create(input: DutyShiftInput): Promise<DutyShift> {
    await this.assertRefs(input);
    const saved = await this.dataSource.getRepository(DutyShiftEntity).save({ ...input });
    return (await this.views([saved]))[0]!;
  }

  async replace(id: number, input: DutyShiftInput): Promise<DutyShift> {
    if (!(await this.dataSource.getRepository(DutyShiftEntity).existsBy({ id }))) throw notFound("shift-not-found", `There is no shift ${id}`);
    await this.assertRefs(input);
    await this.dataSource.getRepository(DutyShiftEntity).update({ id }, input);
    return (await this.views(await this.dataSource.getRepository(DutyShiftEntity).find({ where: { id: In([id]) } })))[0]!;
  }

  async remove(id: number): Promise<void> {
    const result = await this.dataSource.getRepository(DutyShiftEntity).delete({ id });
    if (!result.affected) throw notFound("shift-not-found", `There is no shift ${id}`);
  }
}
