import { useQuery } from "@tanstack/react-query";
import { Outlet, useNavigation } from "react-router-dom";
import { RouteError } from "../../components/errors/route-error";
import { AppShell } from "../../components/layouts/app-shell";
import { MainNav, type NavItem } from "../../components/layouts/main-nav";
import { Loading } from "../../components/ui/loading";
import { useToast } from "../../components/ui/toast";
import { paths } from "../../config/paths";
import { useSession } from "../../features/auth/api/get-session";
import { useUpdateMe } from "../../features/auth/api/update-me";
import { useOpenAlerts } from "../../features/alerts/api/get-alerts";
import { getMailQueryOptions } from "../../features/mail/api/get-mail";
import { UserMenu } from "../../features/auth/components/user-menu";
import { LiveIndicator } from "../../features/live/components/live-indicator";
import { WaitingToSend } from "../../features/offline/components/waiting-to-send";
import { ALLOWED, AuthorizationProvider } from "../../lib/authorization";
import { TemperatureUnitProvider } from "../../lib/temperature-unit";
import type { TemperatureUnit } from "../../../shared/domain/units.js";
import type { Role } from "../../../shared/schemas/auth.js";
import { useLiveUpdates } from "../live-updates";
import { useSessionExpiry, useSignInRedirect } from "../session-guard";

/**
 * The header's page links, each with the roles that may open the page. `demoOnly`: shown in demo
 * mode, or once the local sink has caught mail (the mailbox is empty with a real mail relay).
 */
const NAV_ITEMS: readonly (NavItem & { roles?: readonly Role[]; demoOnly?: boolean })[] = [
  { to: paths.dashboard.to(), label: "Benches", end: true },
  { to: paths.alerts.to(), label: "Alerts" },
  { to: paths.rounds.to(), label: "Walk-through" },
  { to: paths.batches.to(), label: "Batches" },
  { to: paths.reports.to(), label: "Reports" },
  { to: paths.dutyRota.to(), label: "Duty rota" },
  // Every role: growers and viewers read the windows and the change log; only managers and admins edit.
  { to: paths.settings.to(), label: "Settings" },
  { to: paths.users.to(), label: "Users", roles: ALLOWED.manageUsers },
  { to: paths.sensors.to(), label: "Sensors", roles: ALLOWED.manageSensors },
  { to: paths.mailbox.to(), label: "Mailbox", roles: ALLOWED.readMailbox, demoOnly: true },
];

/** The open-alert count beside "Alerts": urgent while any is raised and nobody has taken it. */
function useAlertBadge(): NavItem["badge"] {
  const { data } = useOpenAlerts();
  if (!data) return undefined;
  const count = data.alerts.length;
  const raised = data.alerts.filter((a) => a.phase === "raised").length;
  return { count, label: raised > 0 ? `${count} open, ${raised} not yet acknowledged` : `${count} open`, isUrgent: raised > 0 };
}

/** Outside demo mode an admin still gets the Mailbox link once the local sink has caught something. */
function useHasCaughtMail(isAsked: boolean): boolean {
  const { data } = useQuery({ ...getMailQueryOptions(), enabled: isAsked, refetchInterval: false });
  return (data?.messages.length ?? 0) > 0;
}

/**
 * The frame of every signed-in page: header with the live indicator, the links the role may
 * use and the user menu. The session was restored by the loader (GET /api/session).
 */
export function RootLayout() {
  const { data: session } = useSession();
  const { user } = session;
  const updateMe = useUpdateMe();
  const { showToast } = useToast();
  useSignInRedirect();
  useSessionExpiry(session.expiresAtMs);
  const streamState = useLiveUpdates();
  const navigation = useNavigation();

  const saveUnit = (temperatureUnit: TemperatureUnit) =>
    updateMe.mutate(
      { temperatureUnit },
      { onError: (error) => showToast(`Your temperature unit was not saved: ${error.message}`, "error") },
    );

  const alertBadge = useAlertBadge();
  const hasCaughtMail = useHasCaughtMail(!session.demo && (ALLOWED.readMailbox as readonly Role[]).includes(user.role));
  const navItems = NAV_ITEMS.filter(
    (item) => (!item.roles || item.roles.includes(user.role)) && (!item.demoOnly || session.demo || hasCaughtMail),
  ).map(({ roles: _roles, demoOnly: _demoOnly, ...item }) => (item.to === paths.alerts.to() ? { ...item, badge: alertBadge } : item));

  return (
    <AuthorizationProvider user={user}>
      <TemperatureUnitProvider unit={user.temperatureUnit} onUnitChange={saveUnit}>
        <AppShell
          status={<LiveIndicator state={streamState} />}
          nav={navItems.length > 1 ? <MainNav items={navItems} /> : undefined}
          account={<UserMenu />}
        >
          {navigation.state === "loading" && (
            <div className="fixed inset-x-0 top-0 z-30 h-1 animate-pulse bg-accent" role="progressbar" aria-label="Loading page" />
          )}
          <Outlet />
          {/* Work entered offline and not yet sent: a pill in the corner, within thumb's reach. */}
          <WaitingToSend />
        </AppShell>
      </TemperatureUnitProvider>
    </AuthorizationProvider>
  );
}

/** Shown while the session is restored and the first page's code and data load. */
export function RootFallback() {
  return (
    <AppShell>
      <Loading label="Loading benches…" />
    </AppShell>
  );
}

export function RootErrorBoundary() {
  return (
    <AppShell>
      <RouteError />
    </AppShell>
  );
}
