import { Outlet, useNavigation } from "react-router-dom";
import { RouteError } from "../../components/errors/route-error";
import { AppShell } from "../../components/layouts/app-shell";
import { TemperatureUnitSwitch } from "../../components/layouts/temperature-unit-switch";
import { Loading } from "../../components/ui/loading";
import { LiveIndicator } from "../../features/live/components/live-indicator";
import { useLiveUpdates } from "../live-updates";

/** The frame of every page: header with the live indicator and the °F/°C switch. */
export function RootLayout() {
  const streamState = useLiveUpdates();
  const navigation = useNavigation();
  return (
    <AppShell status={<LiveIndicator state={streamState} />} controls={<TemperatureUnitSwitch />}>
      {navigation.state === "loading" && (
        <div className="fixed inset-x-0 top-0 z-30 h-1 animate-pulse bg-accent" role="progressbar" aria-label="Loading page" />
      )}
      <Outlet />
    </AppShell>
  );
}

/** Shown while the first page's code and data load. */
export function RootFallback() {
  return (
    <AppShell controls={<TemperatureUnitSwitch />}>
      <Loading label="Loading benches…" />
    </AppShell>
  );
}

export function RootErrorBoundary() {
  return (
    <AppShell controls={<TemperatureUnitSwitch />}>
      <RouteError />
    </AppShell>
  );
}
