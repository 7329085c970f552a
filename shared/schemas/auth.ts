import { z } from "zod";

/** The four roles, most powerful first (PRODUCT.md §3). Enforced on the server; the client only hides. */
export const ROLES = ["admin", "manager", "grower", "viewer"] as const;
export const roleSchema = z.enum(ROLES);
export type Role = z.infer<typeof roleSchema>;

export const ROLE_LABELS: Record<Role, string> = {
  admin: "Admin",
  manager: "Manager",
  grower: "Grower",
  viewer: "Viewer",
};

/** What each role may do, in words a person reads on the users page. */
export const ROLE_DESCRIPTIONS: Record<Role, string> = {
  admin: "Everything, including sites, users and sensors",
  manager: "Windows, benches, duty rota, reports and batches",
  grower: "Walk-throughs, batches and observations; acknowledges alerts",
  viewer: "Sees everything, changes nothing",
};

export const temperatureUnitSchema = z.enum(["F", "C"]);

export const emailSchema = z.string().trim().toLowerCase().pipe(z.email("Enter a valid e-mail address")).pipe(z.string().max(254));

/** Passwords: long rather than clever (NIST SP 800-63B §5.1.1: at least 8 characters; we ask 10). */
export const passwordSchema = z
  .string()
  .min(10, "Use at least 10 characters")
  .max(200, "Use at most 200 characters");

export const personNameSchema = z.string().trim().min(1, "Enter a name").max(80, "Use at most 80 characters");

/** A user as the API shows it: never a password hash. */
export const userSchema = z.object({
  id: z.number().int(),
  name: z.string(),
  email: z.string(),
  role: roleSchema,
  temperatureUnit: temperatureUnitSchema,
  disabled: z.boolean(),
  /** False until an invited user has set a password. */
  hasPassword: z.boolean(),
  createdAtMs: z.number(),
  lastSignInMs: z.number().nullable(),
});
export type User = z.infer<typeof userSchema>;

/** POST /api/session */
export const signInInputSchema = z.object({
  email: emailSchema,
  password: z.string().min(1, "Enter your password").max(200),
});
export type SignInInput = z.infer<typeof signInInputSchema>;

/** POST /api/session, GET /api/session */
export const sessionResponseSchema = z.object({
  user: userSchema,
  expiresAtMs: z.number(),
  /** True when this installation runs the demo nursery (the mailbox then holds the demo's mail). */
  demo: z.boolean().default(false),
});
export type SessionResponse = z.infer<typeof sessionResponseSchema>;

/** PATCH /api/me: what a user may change about themselves. */
export const updateMeInputSchema = z
  .object({ name: personNameSchema.optional(), temperatureUnit: temperatureUnitSchema.optional() })
  .refine((v) => v.name !== undefined || v.temperatureUnit !== undefined, { message: "Nothing to change" });
export type UpdateMeInput = z.infer<typeof updateMeInputSchema>;

/** POST /api/users (admin): invite someone by e-mail. */
export const inviteUserInputSchema = z.object({
  name: personNameSchema,
  email: emailSchema,
  role: roleSchema,
});
export type InviteUserInput = z.infer<typeof inviteUserInputSchema>;

/** PATCH /api/users/:id (admin) */
export const updateUserInputSchema = z
  .object({ name: personNameSchema.optional(), role: roleSchema.optional(), disabled: z.boolean().optional() })
  .refine((v) => v.name !== undefined || v.role !== undefined || v.disabled !== undefined, { message: "Nothing to change" });
export type UpdateUserInput = z.infer<typeof updateUserInputSchema>;

export const usersResponseSchema = z.object({ users: z.array(userSchema) });

/** POST /api/password-resets: always answers the same, known address or not. */
export const requestPasswordResetInputSchema = z.object({ email: emailSchema });

/** GET /api/password-links/:token: what the set-password page shows before anything changes. */
export const passwordLinkResponseSchema = z.object({
  purpose: z.enum(["invite", "reset"]),
  name: z.string(),
  email: z.string(),
  expiresAtMs: z.number(),
});
export type PasswordLinkResponse = z.infer<typeof passwordLinkResponseSchema>;

/** POST /api/password-links/:token: set the password; the link then stops working. */
export const setPasswordInputSchema = z
  .object({ password: passwordSchema, confirm: z.string() })
  .refine((v) => v.password === v.confirm, { message: "The two passwords differ", path: ["confirm"] });
export type SetPasswordInput = z.infer<typeof setPasswordInputSchema>;
