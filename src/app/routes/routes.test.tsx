import { act, fireEvent, render, screen, waitFor, within } from "@testing-library/react";
import { RouterProvider, createMemoryRouter } from "react-router-dom";
import { beforeEach, describe, expect, it, vi } from "vitest";
import type { BenchReadingsResponse } from "../../../shared/schemas/readings.js";
import { createQueryClient } from "../../lib/query-client";
import { NOW_MS, USERS, WINDOWS, makeBench, makeSession, makeZone, makeZones, reading } from "../../testing/data";
import { FakeEventSource, createFetchStub } from "../../testing/fakes";
import { AppProvider } from "../provider";
import { createAppRoutes } from "../router";

// Every page needs a session; the unit change is saved with PATCH /api/me.
const SIGNED_IN = {
  "/api/session": () => makeSession(USERS.viewer),
  "/api/me": { user: { ...USERS.viewer, temperatureUnit: "C" } },
};

const ZONES = makeZones([
  makeZone({
    id: 1,
    name: "Fig house",
    siteName: "Hillside nursery",
    benches: [
      makeBench({ id: 1, name: "Bench 1", position: 1 }),
      makeBench({
        id: 2,
        name: "Bench 2",
        position: 2,
        status: "below",
        latest: [reading("air.temperature", 17, "below"), reading("medium.moisture", 0.35, "inside")],
      }),
    ],
  }),
  makeZone({ id: 2, name: "Graft house", siteName: "Hillside nursery", benches: [] }),
]);

// The first visit loads the route's code (the bench route brings recharts), which can take a while on a busy machine.
const FIRST_PAINT = { timeout: 10_000 };
const TEST_TIMEOUT_MS = 20_000;

const READINGS: BenchReadingsResponse = {
  bench: { id: 2, name: "Bench 2", zoneId: 1, zoneName: "Fig house" },
  fromMs: NOW_MS - 24 * 3_600_000,
  toMs: NOW_MS,
  bucketMs: 300_000,
  windows: WINDOWS,
  series: [
    {
      quantity: "air.temperature",
      points: [
        { timeMs: NOW_MS - 600_000, min: 16.5, mean: 17, max: 17.5, count: 5 },
        { timeMs: NOW_MS - 300_000, min: 22, mean: 23, max: 24, count: 5 },
      ],
    },
  ],
};

function renderApp(path: string) {
  const queryClient = createQueryClient();
  const router = createMemoryRouter(createAppRoutes(queryClient), { initialEntries: [path] });
  render(
    <AppProvider queryClient={queryClient}>
      <RouterProvider router={router} />
    </AppProvider>,
  );
  return { queryClient, router };
}

describe("app routes", () => {
  beforeEach(() => {
    vi.setSystemTime(NOW_MS + 30_000);
    FakeEventSource.reset();
    vi.stubGlobal("EventSource", FakeEventSource);
  });

  it("dashboard: zones with their site, bench cards, the out-of-window list, and live updates from the stream", async () => {
    const { stub } = createFetchStub({ ...SIGNED_IN, "/api/zones": ZONES });
    vi.stubGlobal("fetch", stub);
    renderApp("/");

    expect(await screen.findByRole("heading", { name: "Fig house" }, FIRST_PAINT)).toBeTruthy();
    expect(screen.getByRole("heading", { name: "Graft house" })).toBeTruthy();
    expect(screen.getAllByText("Hillside nursery")).toHaveLength(2);
    expect(screen.getAllByRole("article")).toHaveLength(2);

    const summary = screen.getByRole("region", { name: "1 bench out of window" });
    expect(within(summary).getByRole("link", { name: /Bench 2/ }).textContent).toContain("Too cold");

    const stream = FakeEventSource.latest();
    act(() => stream.open());
    expect(screen.getByText("Live").closest("[data-state]")?.getAttribute("data-state")).toBe("live");

    // Bench 2 warms back into its window: its card and the summary follow without a refetch.
    act(() =>
      stream.emit("readings", {
        readings: [{ benchId: 2, sensorId: "probe-1", quantity: "air.temperature", value: 23, timeMs: NOW_MS + 10_000, status: "inside" }],
      }),
    );
    // (TanStack Query notifies its observers on the next tick.)
    expect(await screen.findByText("All 2 benches in window")).toBeTruthy();
    const card = screen.getAllByRole("article")[1]!;
    expect(within(card).getByText("All in window")).toBeTruthy();
    expect(within(card).getByRole("group", { name: "Air temperature" }).textContent).toContain("73.4 °F");
  }, TEST_TIMEOUT_MS);

  it("bench page: latest values, one chart panel per quantity with its window and the day's low and high", async () => {
    const { stub, calls } = createFetchStub({ ...SIGNED_IN, "/api/zones": ZONES, "/api/benches/2/readings": READINGS });
    vi.stubGlobal("fetch", stub);
    renderApp("/benches/2");

    expect(await screen.findByRole("heading", { level: 1, name: "Bench 2" }, FIRST_PAINT)).toBeTruthy();
    expect(calls).toContain("/api/benches/2/readings");

    const latest = screen.getByRole("region", { name: "Latest readings" });
    expect(within(within(latest).getByRole("group", { name: "Air temperature" })).getByText("Too cold")).toBeTruthy();

    const air = screen.getByRole("figure", { name: "Air temperature" });
    expect(within(air).getByText("Window 69.8–80.6 °F")).toBeTruthy();
    expect(air.textContent).toContain("Low 61.7 °F");
    expect(air.textContent).toContain("High 75.2 °F");
    expect(air.textContent).toContain("Out of window 5 min");
    expect(within(screen.getByRole("figure", { name: "Medium moisture" })).getByText("No readings in the last 24 hours")).toBeTruthy();

    // The °F/°C switch in the user menu applies here too.
    fireEvent.click(screen.getByRole("button", { name: /your account/ }));
    fireEvent.click(screen.getByRole("button", { name: "°C" }));
    await waitFor(() => expect(air.textContent).toContain("Low 16.5 °C"));
  }, TEST_TIMEOUT_MS);

  it("bench page: an unknown bench shows the server's not-found message and a way back", async () => {
    const { stub } = createFetchStub({ ...SIGNED_IN, "/api/zones": ZONES });
    vi.stubGlobal("fetch", stub);
    renderApp("/benches/9");

    expect(await screen.findByRole("alert", {}, FIRST_PAINT)).toBeTruthy();
    expect(screen.getByRole("heading", { name: "Not found" })).toBeTruthy();
    expect(screen.getByRole("link", { name: "All benches" }).getAttribute("href")).toBe("/");
  }, TEST_TIMEOUT_MS);
});
