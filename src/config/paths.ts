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
  /** A zone's history: its benches' mean lines (`?range=7d|30d` or `?from=…&to=…` days, like the bench page). */
  zoneHistory: {
    pattern: "/zones/:zoneId",
    to: (zoneId: number) => `/zones/${zoneId}`,
  },
  /** Settings: sites, zones and benches; windows, presets and the change log (read only below manager). */
  settings: {
    pattern: "/settings",
    to: () => "/settings",
  },
  settingsZone: {
    pattern: "/settings/zones/:zoneId",
    to: (zoneId: number) => `/settings/zones/${zoneId}`,
  },
  settingsBench: {
    pattern: "/settings/benches/:benchId",
    to: (benchId: number) => `/settings/benches/${benchId}`,
  },
  windowPresets: {
    pattern: "/settings/presets",
    to: () => "/settings/presets",
  },
  audit: {
    pattern: "/settings/changes",
    to: () => "/settings/changes",
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
  /** `tab`: open (default) or past; the filters are a zone id, a life-cycle phase and a kind. */
  alerts: {
    pattern: "/alerts",
    to: ({ tab, zoneId, phase, kind }: { tab?: "open" | "past"; zoneId?: number; phase?: string; kind?: string } = {}) => {
      const search = new URLSearchParams();
      if (tab && tab !== "open") search.set("tab", tab);
      if (zoneId !== undefined) search.set("zone", String(zoneId));
      if (phase) search.set("phase", phase);
      if (kind) search.set("kind", kind);
      return search.size > 0 ? `/alerts?${search}` : "/alerts";
    },
  },
  alert: {
    pattern: "/alerts/:alertId",
    to: (alertId: number) => `/alerts/${alertId}`,
  },
  /** The page alert e-mails' acknowledge links open (server/alerts/notifier.ts); works signed out. */
  ack: {
    pattern: "/ack",
    to: (token: string) => `/ack?token=${encodeURIComponent(token)}`,
  },
  dutyRota: {
    pattern: "/duty-rota",
    to: () => "/duty-rota",
  },
  /** The morning walk-through: start one (a zone or every zone) or resume one in progress. */
  rounds: {
    pattern: "/rounds",
    to: () => "/rounds",
  },
  /** A round: its bench cards while in progress, its summary once finished (the summary mail links here). */
  round: {
    pattern: "/rounds/:roundId",
    to: (roundId: number) => `/rounds/${roundId}`,
  },
  /** Batches of cuttings; `status` open (default), closed or all; `zone` a zone id; `variety` a name. */
  batches: {
    pattern: "/batches",
    to: ({ status, zoneId, variety }: { status?: "open" | "closed" | "all"; zoneId?: number; variety?: string } = {}) => {
      const search = new URLSearchParams();
      if (status && status !== "open") search.set("status", status);
      if (zoneId !== undefined) search.set("zone", String(zoneId));
      if (variety) search.set("variety", variety);
      return search.size > 0 ? `/batches?${search}` : "/batches";
    },
  },
  newBatch: {
    pattern: "/batches/new",
    /** `benchId`: the bench to preselect. */
    to: (benchId?: number) => (benchId === undefined ? "/batches/new" : `/batches/new?bench=${benchId}`),
  },
  batch: {
    pattern: "/batches/:batchId",
    to: (batchId: number) => `/batches/${batchId}`,
  },
  editBatch: {
    pattern: "/batches/:batchId/edit",
    to: (batchId: number) => `/batches/${batchId}/edit`,
  },
  /** Strike rates per batch, variety and bench beside time in window; CSV exports. */
  reports: {
    pattern: "/reports",
    to: () => "/reports",
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
