import { EntitySchema } from "typeorm";
import type { Role } from "../../../shared/schemas/auth.js";

export interface UserRecord {
  id: number;
  name: string;
  /** Stored lower-case, unique. */
  email: string;
  role: Role;
  temperatureUnit: "F" | "C";
  disabled: boolean;
  /** bcrypt hash; null until an invited user sets a password. */
  passwordHash: string | null;
  /** Bumped at every password change: older sessions and e-mailed links stop working. */
  passwordVersion: number;
  createdAtMs: number;
  lastSignInMs: number | null;
}

export const UserEntity = new EntitySchema<UserRecord>({
  name: "User",
  tableName: "user",
  columns: {
    id: { type: "integer", primary: true, generated: "increment" },
    name: { type: "varchar", length: 80 },
    email: { type: "varchar", length: 254, unique: true },
    role: { type: "varchar", length: 16 },
    temperatureUnit: { type: "varchar", name: "temperature_unit", length: 1, default: "F" },
    disabled: { type: "boolean", default: false },
    passwordHash: { type: "varchar", name: "password_hash", length: 100, nullable: true },
    passwordVersion: { type: "integer", name: "password_version", default: 0 },
    createdAtMs: { type: "integer", name: "created_at_ms" },
    lastSignInMs: { type: "integer", name: "last_sign_in_ms", nullable: true },
  },
});

/** Failed sign-ins per key ("email:<address>" or "ip:<address>") within the current window. */
export interface SignInFailure {
  key: string;
  windowStartMs: number;
  failures: number;
}

export const SignInFailureEntity = new EntitySchema<SignInFailure>({
  name: "SignInFailure",
  tableName: "sign_in_failure",
  columns: {
    key: { type: "varchar", primary: true, length: 300 },
    windowStartMs: { type: "integer", name: "window_start_ms" },
    failures: { type: "integer" },
  },
});
