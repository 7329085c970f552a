import jwt from "jsonwebtoken";

/**
 * Signed acknowledge links, one per e-mail and recipient, covering the alerts in that e-mail.
 * Single use follows from the alerts themselves: once acknowledged, a second use has nothing left
 * to acknowledge and is refused.
 */
export function signAckLink(alertIds: number[], userId: number, secret: string, lifetimeMs: number): string {
  return jwt.sign({ purpose: "ack", aids: alertIds }, secret, { subject: String(userId), expiresIn: Math.round(lifetimeMs / 1000), algorithm: "HS256" });
}

export function verifyAckLink(token: string, secret: string): { alertIds: number[]; userId: number; expiresAtMs: number } | null {
  try {
    const c = jwt.verify(token, secret, { algorithms: ["HS256"] }) as { purpose: string; aids: unknown; sub: string; exp: number };
    if (c.purpose !== "ack" || !Array.isArray(c.aids) || !c.aids.every((n) => Number.isInteger(n)) || !/^\d+$/.test(c.sub)) return null;
    return { alertIds: c.aids as number[], userId: Number(c.sub), expiresAtMs: c.exp * 1000 };
  } catch {
    return null;
  }
}
