import type { QueryClient } from "@tanstack/react-query";
import type { ComponentType } from "react";
import { createBrowserRouter, type LoaderFunction, type RouteObject } from "react-router-dom";
import { paths } from "../config/paths";
import { PublicFallback } from "./routes/public";
import { RootErrorBoundary, RootFallback, RootLayout } from "./routes/root";
import { sessionLoader, withSignInRedirect } from "./session-guard";

/** What a lazy route module exports: a loader factory that receives the QueryClient, the page, its ErrorBoundary. */
export type RouteModule = {
  clientLoader?: (queryClient: QueryClient) => LoaderFunction;
  default: ComponentType;
  ErrorBoundary?: ComponentType;
};

function convert(queryClient: QueryClient, { isSignedIn }: { isSignedIn: boolean }) {
  return ({ clientLoader, default: Component, ErrorBoundary }: RouteModule) => {
    const loader = clientLoader?.(queryClient);
    return {
      // A 401 while loading a signed-in page leads to sign-in, and back here after.
      loader: loader && isSignedIn ? withSignInRedirect(loader) : loader,
      Component,
      ErrorBoundary,
    };
  };
}

/** The route tree; pages load lazily so the charting code stays out of the first chunk. */
export function createAppRoutes(queryClient: QueryClient): RouteObject[] {
  const publicPage = convert(queryClient, { isSignedIn: false });
  const signedInPage = convert(queryClient, { isSignedIn: true });
  return [
    // Pages used before signing in: no header, no live stream, no session needed.
    {
      path: paths.signIn.pattern,
      HydrateFallback: PublicFallback,
      lazy: () => import("./routes/auth/sign-in").then(publicPage),
    },
    {
      path: paths.requestPasswordReset.pattern,
      HydrateFallback: PublicFallback,
      lazy: () => import("./routes/auth/reset-password").then(publicPage),
    },
    {
      path: paths.setPassword.pattern,
      HydrateFallback: PublicFallback,
      lazy: () => import("./routes/auth/set-password").then(publicPage),
    },
    // Alert e-mails' acknowledge links: the signed token is the proof, no session needed.
    {
      path: paths.ack.pattern,
      HydrateFallback: PublicFallback,
      lazy: () => import("./routes/ack/ack").then(publicPage),
    },
    // Everything else needs a session, restored from the cookie by the layout's loader.
    {
      path: "/",
      id: "signed-in",
      loader: withSignInRedirect(sessionLoader(queryClient)),
      Component: RootLayout,
      HydrateFallback: RootFallback,
      ErrorBoundary: RootErrorBoundary,
      children: [
        {
          index: true,
          lazy: () => import("./routes/dashboard").then(signedInPage),
        },
        {
          path: paths.bench.pattern,
          lazy: () => import("./routes/benches/bench").then(signedInPage),
        },
        {
          path: paths.zoneHistory.pattern,
          lazy: () => import("./routes/history/zone").then(signedInPage),
        },
        {
          path: paths.settings.pattern,
          lazy: () => import("./routes/settings/settings").then(signedInPage),
        },
        {
          path: paths.settingsZone.pattern,
          lazy: () => import("./routes/settings/zone").then(signedInPage),
        },
        {
          path: paths.settingsBench.pattern,
          lazy: () => import("./routes/settings/bench").then(signedInPage),
        },
        {
          path: paths.windowPresets.pattern,
          lazy: () => import("./routes/settings/presets").then(signedInPage),
        },
        {
          path: paths.audit.pattern,
          lazy: () => import("./routes/settings/changes").then(signedInPage),
        },
        {
          path: paths.alerts.pattern,
          lazy: () => import("./routes/alerts/alerts").then(signedInPage),
        },
        {
          path: paths.alert.pattern,
          lazy: () => import("./routes/alerts/alert").then(signedInPage),
        },
        {
          path: paths.dutyRota.pattern,
          lazy: () => import("./routes/rota/duty-rota").then(signedInPage),
        },
        {
          path: paths.rounds.pattern,
          lazy: () => import("./routes/rounds/rounds").then(signedInPage),
        },
        {
          path: paths.round.pattern,
          lazy: () => import("./routes/rounds/round").then(signedInPage),
        },
        {
          path: paths.batches.pattern,
          lazy: () => import("./routes/batches/batches").then(signedInPage),
        },
        {
          path: paths.newBatch.pattern,
          lazy: () => import("./routes/batches/new-batch").then(signedInPage),
        },
        {
          path: paths.batch.pattern,
          lazy: () => import("./routes/batches/batch").then(signedInPage),
        },
        {
          path: paths.editBatch.pattern,
          lazy: () => import("./routes/batches/edit-batch").then(signedInPage),
        },
        {
          path: paths.reports.pattern,
          lazy: () => import("./routes/reports/reports").then(signedInPage),
        },
        {
          path: paths.users.pattern,
          lazy: () => import("./routes/admin/users").then(signedInPage),
        },
        {
          path: paths.sensors.pattern,
          lazy: () => import("./routes/admin/sensors").then(signedInPage),
        },
        {
          path: paths.mailbox.pattern,
          lazy: () => import("./routes/admin/mailbox").then(signedInPage),
        },
        {
          path: "*",
          lazy: () => import("./routes/not-found").then(signedInPage),
        },
      ],
    },
  ];
}

export function createAppRouter(queryClient: QueryClient) {
  return createBrowserRouter(createAppRoutes(queryClient));
}
