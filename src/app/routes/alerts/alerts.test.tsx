import { fireEvent, screen, waitFor, within } from "@testing-library/react";
import { beforeEach, describe, expect, it, vi } from "vitest";
import type { Role } from "../../../../shared/schemas/auth.js";
import { NOW_MS, USERS, makeAlert, makeSession, makeZone, makeZones } from "../../../testing/data";
import { createApiFake, problem } from "../../../testing/fakes";
import { FIRST_PAINT, ROUTE_TEST_TIMEOUT_MS, renderApp } from "../../../testing/render-app";

const RAISED = makeAlert({ id: 5, benchName: "Bench 2", benchId: 2 });
const CONDENSATION = makeAlert({
  id: 6,
  kind: "condensation",
  phase: "acknowledged",
  quantity: null,
  direction: null,
  lastValue: 1,
  worstValue: 0.5,
  windowMin: null,
  windowMax: null,
  acknowledgedAtMs: NOW_MS - 5 * 60_000,
  acknowledgedByName: "Marisol Night",
  acknowledgeNote: "Vents opened",
  summary: "Condensation risk",
});

function apiFor(role: Role, alerts = [RAISED, CONDENSATION]) {
  return createApiFake({
    "GET /api/session": { body: makeSession(USERS[role]) },
    "GET /api/zones": { body: makeZones([makeZone({ id: 1 }), makeZone({ id: 2, name: "Graft house", benches: [] })]) },
    "GET /api/alerts": ({ search }) => {
      const params = new URLSearchParams(search);
      if (params.get("status") === "past") return { body: { alerts: [] } };
      return { body: { alerts: alerts.filter((a) => !params.get("zoneId") || String(a.zoneId) === params.get("zoneId")) } };
    },
  });
}

function row(name: RegExp) {
  return screen.getAllByRole("row").find((r) => name.test(r.textContent ?? ""))!;
}

describe("alerts page", () => {
  beforeEach(() => vi.setSystemTime(NOW_MS + 30_000));

  it(
    "lists each open alert with bench, zone, what, value, since when, phase in words and icon, and who acknowledged with the note",
    async () => {
      renderApp("/alerts", apiFor("viewer"));
      expect(await screen.findByRole("heading", { name: "2 open alerts" }, FIRST_PAINT)).toBeTruthy();
      const raised = row(/Bench 2/);
      expect(raised.textContent).toContain("Air too cold");
      expect(raised.textContent).toContain("Fig house");
      expect(raised.textContent).toContain("59.0 °F");
      expect(raised.textContent).toContain("Window 69.8–80.6 °F");
      expect(raised.textContent).toContain("Lowest 58.1 °F");
      expect(raised.textContent).toMatch(/4[01] min so far/);
      expect(raised.textContent).toContain("Nobody yet");
      const phase = raised.querySelector("[data-phase='raised']");
      expect(phase?.textContent).toBe("Raised");
      expect(phase?.querySelector("svg[data-icon='phase-raised']")).not.toBeNull();

      const taken = row(/Condensation risk/);
      expect(taken.textContent).toContain("Marisol Night");
      expect(taken.textContent).toContain("Vents opened");
      expect(taken.querySelector("svg[data-icon='phase-acknowledged']")).not.toBeNull();
    },
    ROUTE_TEST_TIMEOUT_MS,
  );

  it(
    "shows a condensation alert's dew-point margin in °F as a temperature difference (× 1.8, no +32)",
    async () => {
      renderApp("/alerts", apiFor("viewer"));
      await screen.findByRole("heading", { name: "2 open alerts" }, FIRST_PAINT);
      const taken = row(/Condensation risk/);
      // 1 °C of margin is 1.8 °F of margin, not 33.8 °F.
      expect(taken.textContent).toContain("1.8 °F above the dew point");
      expect(taken.textContent).toContain("Closest 0.9 °F above the dew point");
      expect(taken.textContent).not.toContain("33.8");
    },
    ROUTE_TEST_TIMEOUT_MS,
  );

  it(
    "hides the acknowledge button from a viewer",
    async () => {
      const api = apiFor("viewer");
      renderApp("/alerts", api);
      await screen.findByRole("heading", { name: "2 open alerts" }, FIRST_PAINT);
      expect(screen.queryByRole("button", { name: /I've got it/ })).toBeNull();
      expect(api.requests.some((r) => r.method === "POST")).toBe(false);
    },
    ROUTE_TEST_TIMEOUT_MS,
  );

  it(
    "a grower acknowledges a raised alert with a note; the row then shows who, and the acknowledged alert offers no button",
    async () => {
      const api = apiFor("grower");
      const done = { ...RAISED, phase: "acknowledged" as const, acknowledgedAtMs: NOW_MS + 30_000, acknowledgedByName: "Gil Grower", acknowledgeNote: "On my way" };
      api.routes["POST /api/alerts/5/acknowledge"] = { body: { alert: done } };
      renderApp("/alerts", api);
      await screen.findByRole("heading", { name: "2 open alerts" }, FIRST_PAINT);
      // Only the raised one can be taken.
      expect(screen.getAllByRole("button", { name: /I've got it/ })).toHaveLength(1);
      fireEvent.click(screen.getByRole("button", { name: "I've got it: acknowledge Air too cold on Bench 2" }));

      const dialog = screen.getByRole("dialog", { name: "Acknowledge this alert" });
      fireEvent.change(within(dialog).getByLabelText("Note (optional)"), { target: { value: "On my way " } });
      fireEvent.click(within(dialog).getByRole("button", { name: "Acknowledge" }));

      await waitFor(() => expect(row(/Bench 2/).textContent).toContain("Gil Grower"));
      expect(api.sent("POST /api/alerts/5/acknowledge")[0]?.body).toEqual({ note: "On my way" });
      expect(row(/Bench 2/).textContent).toContain("On my way");
      expect(screen.queryByRole("button", { name: /I've got it/ })).toBeNull();
      expect(screen.queryByRole("dialog")).toBeNull();
    },
    ROUTE_TEST_TIMEOUT_MS,
  );

  it(
    "someone else took it first: the dialog says who, plainly",
    async () => {
      const api = apiFor("manager");
      api.routes["POST /api/alerts/5/acknowledge"] = problem(409, "alert-not-acknowledgeable", "Already acknowledged by Marisol Night");
      renderApp("/alerts", api);
      await screen.findByRole("heading", { name: "2 open alerts" }, FIRST_PAINT);
      fireEvent.click(screen.getByRole("button", { name: /I've got it/ }));
      const dialog = screen.getByRole("dialog");
      fireEvent.click(within(dialog).getByRole("button", { name: "Acknowledge" }));
      expect(await within(dialog).findByText("Already acknowledged by Marisol Night")).toBeTruthy();
    },
    ROUTE_TEST_TIMEOUT_MS,
  );

  it(
    "filters by zone through the address, and the past tab asks for cleared alerts",
    async () => {
      const api = apiFor("viewer");
      const { location } = renderApp("/alerts", api);
      await screen.findByRole("heading", { name: "2 open alerts" }, FIRST_PAINT);
      fireEvent.change(screen.getByRole("combobox", { name: "Zone" }), { target: { value: "2" } });
      expect(await screen.findByText("No open alerts match these filters.")).toBeTruthy();
      expect(location()).toBe("/alerts?zone=2");
      expect(api.requests.some((r) => r.path === "/api/alerts" && r.search.includes("zoneId=2") && r.search.includes("status=open"))).toBe(true);

      fireEvent.click(screen.getByRole("link", { name: "Past" }));
      expect(await screen.findByText("No past alerts match these filters.")).toBeTruthy();
      expect(location()).toBe("/alerts?tab=past&zone=2");
      expect(api.requests.some((r) => r.search.includes("status=past"))).toBe(true);
      // Past alerts have all cleared: no phase filter.
      expect(screen.queryByRole("combobox", { name: "Phase" })).toBeNull();
    },
    ROUTE_TEST_TIMEOUT_MS,
  );
});
