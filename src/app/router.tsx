import type { QueryClient } from "@tanstack/react-query";
import type { ComponentType } from "react";
import { createBrowserRouter, type LoaderFunction, type RouteObject } from "react-router-dom";
import { paths } from "../config/paths";
import { RootErrorBoundary, RootFallback, RootLayout } from "./routes/root";

/** What a lazy route module exports: a loader factory that receives the QueryClient, the page, its ErrorBoundary. */
export type RouteModule = {
  clientLoader?: (queryClient: QueryClient) => LoaderFunction;
  default: ComponentType;
  ErrorBoundary?: ComponentType;
};

function convert(queryClient: QueryClient) {
  return ({ clientLoader, default: Component, ErrorBoundary }: RouteModule) => ({
    loader: clientLoader?.(queryClient),
    Component,
    ErrorBoundary,
  });
}

/** The route tree; pages load lazily so the charting code stays out of the first chunk. */
export function createAppRoutes(queryClient: QueryClient): RouteObject[] {
  return [
    {
      path: "/",
      Component: RootLayout,
      HydrateFallback: RootFallback,
      ErrorBoundary: RootErrorBoundary,
      children: [
        {
          index: true,
          lazy: () => import("./routes/dashboard").then(convert(queryClient)),
        },
        {
          path: paths.bench.pattern,
          lazy: () => import("./routes/benches/bench").then(convert(queryClient)),
        },
        {
          path: "*",
          lazy: () => import("./routes/not-found").then(convert(queryClient)),
        },
      ],
    },
  ];
}

export function createAppRouter(queryClient: QueryClient) {
  return createBrowserRouter(createAppRoutes(queryClient));
}
