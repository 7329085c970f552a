import { act, screen, waitFor, within } from "@testing-library/react";
import { beforeEach, describe, expect, it, vi } from "vitest";
import { NOW_MS, USERS, makeAlert, makeBench, makeSession, makeZone, makeZones } from "../../../testing/data";
import { FakeEventSource, createApiFake } from "../../../testing/fakes";
import { FIRST_PAINT, ROUTE_TEST_TIMEOUT_MS, renderApp } from "../../../testing/render-app";

const RAISED = makeAlert({ id: 9, benchId: 2, benchName: "Bench 2", raisedAtMs: NOW_MS - 30 * 60_000 });
const WATCHING = makeAlert({ id: 10, benchId: 1, benchName: "Bench 1", phase: "watching", raisedAtMs: null, quantity: "medium.moisture", direction: "above", lastValue: 0.6, worstValue: 0.6, windowMin: 0.25, windowMax: 0.45, summary: "Medium too wet" });

function api() {
  return createApiFake({
    "GET /api/session": { body: makeSession(USERS.grower) },
    "GET /api/zones": {
      body: makeZones([
        makeZone({
          benches: [
            makeBench({ id: 1, name: "Bench 1", alerts: [WATCHING] }),
            makeBench({ id: 2, name: "Bench 2", position: 2, alerts: [RAISED] }),
          ],
        }),
      ]),
    },
    "GET /api/alerts": { body: { alerts: [RAISED, WATCHING] } },
  });
}

function card(name: string) {
  return screen.getByRole("article", { name: new RegExp(`^${name}\\b`) });
}

function alertsLink() {
  return within(screen.getByRole("navigation", { name: "Pages" })).getByRole("link", { name: /^Alerts/ });
}

describe("alerts on the dashboard, live", () => {
  beforeEach(() => vi.setSystemTime(NOW_MS + 30_000));

  it(
    "bench cards show their open alerts and the navigation counts them; an 'alerts' stream event updates both without a reload",
    async () => {
      const fake = api();
      renderApp("/", fake);
      await screen.findByRole("heading", { name: "Fig house" }, FIRST_PAINT);

      const raisedLine = within(card("Bench 2")).getByRole("link", { name: /Raised .* · Air too cold/ });
      expect(raisedLine.getAttribute("href")).toBe("/alerts/9");
      expect(raisedLine.querySelector("svg[data-icon='phase-raised']")).not.toBeNull();
      expect(within(card("Bench 1")).getByRole("link", { name: /Watching: hold-off running · Medium too wet · 60 % VWC/ })).toBeTruthy();

      await waitFor(() => expect(alertsLink().textContent).toContain("2"));
      expect(alertsLink().querySelector("[data-badge='urgent']")).not.toBeNull();
      expect(alertsLink().textContent).toContain("2 open, 1 not yet acknowledged");

      const source = FakeEventSource.latest();
      act(() => source.open());
      act(() =>
        source.emit("alerts", {
          alerts: [{ ...RAISED, phase: "acknowledged", acknowledgedAtMs: NOW_MS + 20_000, acknowledgedByName: "Marisol Night" }],
        }),
      );
      // The cache's observers are told on the next tick.
      expect(await within(card("Bench 2")).findByRole("link", { name: /Acknowledged by Marisol Night · Air too cold/ })).toBeTruthy();
      expect(within(card("Bench 2")).queryByText(/Raised/)).toBeNull();
      await waitFor(() => expect(alertsLink().querySelector("[data-badge='calm']")).not.toBeNull());
      expect(alertsLink().textContent).toContain("2 open");

      // Cleared alerts leave the cards and the count.
      act(() => source.emit("alerts", { alerts: [{ ...WATCHING, phase: "cleared", clearedAtMs: NOW_MS + 25_000 }] }));
      await waitFor(() => expect(within(card("Bench 1")).queryByRole("list", { name: /Open alerts/ })).toBeNull());
      await waitFor(() => expect(alertsLink().textContent).toContain("1 open"));

      // A new alert of another bench is added.
      act(() => source.emit("alerts", { alerts: [makeAlert({ id: 11, benchId: 1, benchName: "Bench 1", phase: "watching", raisedAtMs: null })] }));
      expect(await within(card("Bench 1")).findByRole("link", { name: /Watching: hold-off running · Air too cold/ })).toBeTruthy();
      await waitFor(() => expect(alertsLink().textContent).toContain("2 open"));
      // Nothing was asked again: the stream's data was enough.
      expect(fake.sent("GET /api/zones")).toHaveLength(1);
    },
    ROUTE_TEST_TIMEOUT_MS,
  );

  it(
    "acknowledging on the bench page puts the answer on the card at once, even before the stream says so",
    async () => {
      const fake = api();
      fake.routes["GET /api/benches/2/readings"] = {
        body: { bench: { id: 2, name: "Bench 2", zoneId: 1, zoneName: "Fig house" }, fromMs: NOW_MS - 86_400_000, toMs: NOW_MS, bucketMs: 300_000, windows: [], series: [] },
      };
      fake.routes["POST /api/alerts/9/acknowledge"] = {
        body: { alert: { ...RAISED, phase: "acknowledged", acknowledgedAtMs: NOW_MS + 20_000, acknowledgedByName: "Gil Grower" } },
      };
      const { router } = renderApp("/benches/2", fake);
      const section = await screen.findByRole("region", { name: "1 open alert" }, FIRST_PAINT);
      act(() => within(section).getByRole("button", { name: /I've got it/ }).click());
      act(() => within(screen.getByRole("dialog")).getByRole("button", { name: "Acknowledge" }).click());
      await waitFor(() => expect(within(section).getByText(/Acknowledged by/).textContent).toContain("Gil Grower"));

      await act(() => router.navigate("/"));
      expect(await within(await screen.findByRole("article", { name: /^Bench 2\b/ })).findByRole("link", { name: /Acknowledged by Gil Grower/ })).toBeTruthy();
    },
    ROUTE_TEST_TIMEOUT_MS,
  );
});
