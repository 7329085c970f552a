/** Every client route, so links and the router agree. */
export const paths = {
  dashboard: {
    pattern: "/",
    to: () => "/",
  },
  bench: {
    pattern: "/benches/:benchId",
    to: (benchId: number) => `/benches/${benchId}`,
  },
  signIn: {
    pattern: "/sign-in",
    /** `next`: where to go after signing in (a path on this site); `email`: prefilled address. */
    to: ({ next, email }: { next?: string; email?: string } = {}) => {
      const search = new URLSearchParams();
      if (next && next !== "/") search.set("next", next);
      if (email) search.set("email", email);
      return search.size > 0 ? `/sign-in?${search}` : "/sign-in";
    },
  },
  requestPasswordReset: {
    pattern: "/reset-password",
    to: () => "/reset-password",
  },
  /** The page e-mailed invite and reset links open (server/modules/users/users.service.ts). */
  setPassword: {
    pattern: "/set-password",
    to: (token: string) => `/set-password?token=${encodeURIComponent(token)}`,
  },
  users: {
    pattern: "/users",
    to: () => "/users",
  },
  sensors: {
    pattern: "/sensors",
    to: () => "/sensors",
  },
  mailbox: {
    pattern: "/mailbox",
    to: (messageId?: number) => (messageId === undefined ? "/mailbox" : `/mailbox?message=${messageId}`),
  },
} as const;

/**
 * A `next` value safe to navigate to: a path on this site. Anything else (another origin,
 * `//host`, `javascript:`) falls back to the dashboard, so the sign-in page cannot be used to
 * send someone elsewhere.
 */
export function safeNextPath(next: string | null | undefined): string {
  if (!next || !next.startsWith("/") || next.startsWith("//") || next.startsWith("/\\")) return paths.dashboard.to();
  if (next.startsWith(paths.signIn.pattern)) return paths.dashboard.to();
  return next;
}
