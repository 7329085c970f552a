import bcrypt from "bcryptjs";
import type { DataSource } from "typeorm";
import type { InviteUserInput, Role, UpdateMeInput, UpdateUserInput, User } from "../../../shared/schemas/auth.js";
import { SignInFailureEntity, UserEntity, type UserRecord } from "../../db/entities/user.entity.js";
import { AppError, notFound } from "../../lib/errors.js";
import type { Logger } from "../../lib/logger.js";
import type { Mailer } from "../../mail/outbox.js";
import { signPasswordLink, verifyPasswordLink, type LinkPurpose } from "./password-links.js";

/** bcrypt cost: 2^12 rounds, about a quarter second here; the issue asks for at least 10. */
export const BCRYPT_COST = 12;

/** Sign-in throttling (common practice; OWASP Authentication Cheat Sheet, "Login Throttling"). */
export const SIGN_IN_LIMITS = { windowMs: 15 * 60_000, perAddress: 5, perIp: 30 };

// Compared against when the address is unknown, so both answers take the same time.
const DUMMY_HASH = bcrypt.hashSync("no such user, no such password", BCRYPT_COST);

export function toUserView(u: UserRecord): User {
  return {
    id: u.id,
    name: u.name,
    email: u.email,
    role: u.role,
    temperatureUnit: u.temperatureUnit,
    disabled: u.disabled,
    hasPassword: u.passwordHash !== null,
    createdAtMs: u.createdAtMs,
    lastSignInMs: u.lastSignInMs,
  };
}

export interface UsersServiceOptions {
  secret: string;
  appUrl: string;
  mailer: Mailer;
  logger: Logger;
  now?: () => number;
}

export class UsersService {
  private readonly now: () => number;

  constructor(
    private readonly dataSource: DataSource,
    private readonly options: UsersServiceOptions,
  ) {
    this.now = options.now ?? Date.now;
  }

  private get users() {
    return this.dataSource.getRepository(UserEntity);
  }

  async findActive(id: number): Promise<UserRecord | null> {
    const user = await this.users.findOneBy({ id });
    return user && !user.disabled ? user : null;
  }

  async list(): Promise<User[]> {
    return (await this.users.find({ order: { name: "ASC", id: "ASC" } })).map(toUserView);
  }

  /** Creates a user with a password right away (demo seed, the admin:create CLI). */
  async createWithPassword(input: { name: string; email: string; role: Role; password: string }): Promise<User> {
    const email = input.email.toLowerCase();
    if (await this.users.existsBy({ email })) throw new AppError("email-taken", `${email} already has an account`, 409);
    const saved = await this.users.save({
      name: input.name,
      email,
      role: input.role,
      temperatureUnit: "F",
      disabled: false,
      passwordHash: await bcrypt.hash(input.password, BCRYPT_COST),
      passwordVersion: 1,
      createdAtMs: this.now(),
      lastSignInMs: null,
    });
    return toUserView(saved);
  }

  // ── sign-in ──────────────────────────────────────────────────────────────

  private async tooManyFailures(key: string, limit: number): Promise<number | null> {
    const row = await this.dataSource.getRepository(SignInFailureEntity).findOneBy({ key });
    if (!row || this.now() - row.windowStartMs > SIGN_IN_LIMITS.windowMs || row.failures < limit) return null;
    return row.windowStartMs + SIGN_IN_LIMITS.windowMs - this.now();
  }

  private async recordFailure(key: string): Promise<void> {
    const repo = this.dataSource.getRepository(SignInFailureEntity);
    const row = await repo.findOneBy({ key });
    if (!row || this.now() - row.windowStartMs > SIGN_IN_LIMITS.windowMs) {
      await repo.save({ key, windowStartMs: this.now(), failures: 1 });
    } else {
      await repo.update({ key }, { failures: row.failures + 1 });
    }
  }

  /**
   * Checks e-mail and password. The same answer for an unknown address, a wrong password and a
   * disabled account, so the API never tells which addresses have accounts.
   */
  async signIn(email: string, password: string, ip: string): Promise<UserRecord> {
    const addressKey = `email:${email}`;
    const ipKey = `ip:${ip}`;
    const waitMs = (await this.tooManyFailures(addressKey, SIGN_IN_LIMITS.perAddress)) ?? (await this.tooManyFailures(ipKey, SIGN_IN_LIMITS.perIp));
    if (waitMs !== null) {
      const minutes = Math.max(1, Math.ceil(waitMs / 60_000));
      throw new AppError(
        "too-many-sign-in-attempts",
        `Too many failed sign-ins. Try again in ${minutes} minute${minutes === 1 ? "" : "s"}, or reset your password.`,
        429,
      );
    }
    const user = await this.users.findOneBy({ email });
    const matches = await bcrypt.compare(password, user?.passwordHash ?? DUMMY_HASH);
    if (!user || !user.passwordHash || !matches || user.disabled) {
      await this.recordFailure(addressKey);
      await this.recordFailure(ipKey);
      throw new AppError("invalid-credentials", "That e-mail and password do not match an active account", 401);
    }
    await this.dataSource.getRepository(SignInFailureEntity).delete({ key: addressKey });
    await this.users.update({ id: user.id }, { lastSignInMs: this.now() });
    return { ...user, lastSignInMs: this.now() };
  }

  async updateMe(id: number, input: UpdateMeInput): Promise<User> {
    await this.users.update({ id }, input);
    return toUserView(await this.users.findOneByOrFail({ id }));
  }

  // ── administration ───────────────────────────────────────────────────────

  async invite(input: InviteUserInput, invitedBy: number): Promise<User> {
    if (await this.users.existsBy({ email: input.email })) throw new AppError("email-taken", `${input.email} already has an account`, 409);
    const inviter = await this.users.findOneBy({ id: invitedBy });
    const user = await this.users.save({
      name: input.name,
      email: input.email,
      role: input.role,
      temperatureUnit: "F",
      disabled: false,
      passwordHash: null,
      passwordVersion: 0,
      createdAtMs: this.now(),
      lastSignInMs: null,
    });
    await this.mailLink("invite", user, inviter?.name ?? "An admin");
    return toUserView(user);
  }

  async update(id: number, input: UpdateUserInput, actingUserId: number): Promise<User> {
    return this.dataSource.transaction(async (tx) => {
      const users = tx.getRepository(UserEntity);
      const user = await users.findOneBy({ id });
      if (!user) throw notFound("user-not-found", `There is no user ${id}`);
      const losesAdmin = user.role === "admin" && !user.disabled && ((input.role && input.role !== "admin") || input.disabled === true);
      if (losesAdmin) {
        const activeAdmins = await users.countBy({ role: "admin", disabled: false });
        if (activeAdmins <= 1) throw new AppError("last-admin", "This is the only active admin; make someone else admin first", 409);
      }
      if (id === actingUserId && input.disabled === true) throw new AppError("cannot-disable-self", "You cannot disable your own account", 409);
      await users.update({ id }, input);
      return toUserView(await users.findOneByOrFail({ id }));
    });
  }

  // ── e-mailed links ───────────────────────────────────────────────────────

  private async mailLink(purpose: LinkPurpose, user: UserRecord, inviterName?: string): Promise<void> {
    const token = signPasswordLink(purpose, user, this.options.secret);
    const link = `${this.options.appUrl.replace(/\/$/, "")}/set-password?token=${encodeURIComponent(token)}`;
    const text =
      purpose === "invite"
        ? `Hello ${user.name},\n\n${inviterName} has invited you to Benchwarden, the bench monitor of your nursery.\n\nChoose a password to start (this link works once, for 7 days):\n${link}\n\nIf you did not expect this, ignore this message.\n`
        : `Hello ${user.name},\n\nSomeone asked to reset the Benchwarden password for ${user.email}.\n\nChoose a new password (this link works once, for 1 hour):\n${link}\n\nIf it was not you, ignore this message: your password stays as it is.\n`;
    await this.options.mailer.enqueue({
      to: user.email,
      subject: purpose === "invite" ? "You are invited to Benchwarden" : "Reset your Benchwarden password",
      text,
    });
  }

  /** Mails a reset link when the address belongs to an active user; silent otherwise. */
  async requestPasswordReset(email: string): Promise<void> {
    const user = await this.users.findOneBy({ email });
    if (!user || user.disabled) {
      this.options.logger.info("password reset asked for an address without an active account");
      return;
    }
    await this.mailLink("reset", user);
  }

  private async userForLink(token: string): Promise<{ user: UserRecord; purpose: LinkPurpose; expiresAtMs: number }> {
    const link = verifyPasswordLink(token, this.options.secret);
    const user = link ? await this.users.findOneBy({ id: link.userId }) : null;
    if (!link || !user || user.disabled || user.passwordVersion !== link.passwordVersion) {
      throw new AppError("link-not-valid", "This link has expired or has already been used. Ask for a new one.", 410);
    }
    return { user, purpose: link.purpose, expiresAtMs: link.expiresAtMs };
  }

  async describeLink(token: string) {
    const { user, purpose, expiresAtMs } = await this.userForLink(token);
    return { purpose, name: user.name, email: user.email, expiresAtMs };
  }

  async setPasswordWithLink(token: string, password: string): Promise<UserRecord> {
    const { user } = await this.userForLink(token);
    const passwordHash = await bcrypt.hash(password, BCRYPT_COST);
    // Conditional on the version the link carried: two tabs racing with one link set it once.
    const result = await this.users.update({ id: user.id, passwordVersion: user.passwordVersion }, { passwordHash, passwordVersion: user.passwordVersion + 1 });
    if (!result.affected) throw new AppError("link-not-valid", "This link has already been used. Ask for a new one.", 410);
    return this.users.findOneByOrFail({ id: user.id });
  }
}
