// Renders the whole app (providers + route tree) on a memory router, for route tests.
import { render } from "@testing-library/react";
import { RouterProvider, createMemoryRouter } from "react-router-dom";
import { vi } from "vitest";
import { AppProvider } from "../app/provider";
import { createAppRoutes } from "../app/router";
import { createQueryClient } from "../lib/query-client";
import { FakeEventSource, type createApiFake } from "./fakes";

/** The first visit loads a route's code lazily, which can take a while on a busy machine. */
export const FIRST_PAINT = { timeout: 10_000 };
export const ROUTE_TEST_TIMEOUT_MS = 20_000;

export function renderApp(path: string, api: ReturnType<typeof createApiFake>) {
  vi.stubGlobal("fetch", api.fetch);
  FakeEventSource.reset();
  vi.stubGlobal("EventSource", FakeEventSource);
  const queryClient = createQueryClient();
  const router = createMemoryRouter(createAppRoutes(queryClient), { initialEntries: [path] });
  const view = render(
    <AppProvider queryClient={queryClient}>
      <RouterProvider router={router} />
    </AppProvider>,
  );
  const location = () => router.state.location.pathname + router.state.location.search;
  return { ...view, queryClient, router, location };
}
