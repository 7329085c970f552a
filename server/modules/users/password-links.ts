import jwt from "jsonwebtoken";

export type LinkPurpose = "invite" | "reset";

/** How long an e-mailed link works: a week to accept an invitation, an hour to reset a password. */
export const LINK_LIFETIME_S: Record<LinkPurpose, number> = { invite: 7 * 24 * 3600, reset: 3600 };

/**
 * Signed set-password links. Single use without a table: a link carries the user's password
 * version, which setting the password bumps, so the same link then fails verification.
 */
export function signPasswordLink(purpose: LinkPurpose, user: { id: number; passwordVersion: number }, secret: string): string {
  return jwt.sign({ purpose, pwv: user.passwordVersion }, secret, {
    subject: String(user.id),
    expiresIn: LINK_LIFETIME_S[purpose],
    algorithm: "HS256",
  });
}

export function verifyPasswordLink(token: string, secret: string): { purpose: LinkPurpose; userId: number; passwordVersion: number; expiresAtMs: number } | null {
  try {
    const c = jwt.verify(token, secret, { algorithms: ["HS256"] }) as { purpose: string; pwv: number; sub: string; exp: number };
    if ((c.purpose !== "invite" && c.purpose !== "reset") || !/^\d+$/.test(c.sub)) return null;
    return { purpose: c.purpose, userId: Number(c.sub), passwordVersion: c.pwv, expiresAtMs: c.exp * 1000 };
  } catch {
    return null;
  }
}
