import { render, screen, within } from "@testing-library/react";
import { beforeEach, describe, expect, it, vi } from "vitest";
import type { Role } from "../../../shared/schemas/auth.js";
import { ALLOWED, AuthorizationProvider, Authorized } from "../../lib/authorization";
import { NOW_MS, USERS, makeSensor, makeSession, makeZones } from "../../testing/data";
import { createApiFake, problem } from "../../testing/fakes";
import { FIRST_PAINT, ROUTE_TEST_TIMEOUT_MS, renderApp } from "../../testing/render-app";

const EDIT_CONTROLS = /register|new secret|disable|enable|move|invite|send invitation|role of/i;

function apiFor(role: Role) {
  const forbidden = problem(403, "forbidden", `Your role (${role}) may not do this`);
  const isAdmin = role === "admin";
  return createApiFake({
    "GET /api/session": { body: makeSession(USERS[role]) },
    "GET /api/zones": { body: makeZones() },
    "GET /api/sensors": isAdmin ? { body: { sensors: [makeSensor()] } } : forbidden,
    "GET /api/users": isAdmin ? { body: { users: Object.values(USERS) } } : forbidden,
    "GET /api/mail": isAdmin ? { body: { messages: [] } } : forbidden,
  });
}

describe("role-aware navigation and pages", () => {
  beforeEach(() => vi.setSystemTime(NOW_MS + 30_000));

  it(
    "a viewer gets no links to admin pages and no edit control on the benches",
    async () => {
      renderApp("/", apiFor("viewer"));
      expect(await screen.findByRole("heading", { name: "Fig house" }, FIRST_PAINT)).toBeTruthy();
      const nav = screen.getByRole("navigation", { name: "Pages" });
      expect(within(nav).getAllByRole("link").map((l) => l.textContent)).toEqual(["Benches", "Alerts", "Walk-through", "Batches", "Reports", "Duty rota", "Settings"]);
      for (const name of ["Users", "Sensors", "Mailbox"]) expect(screen.queryByRole("link", { name })).toBeNull();
      // The only button is the viewer's own account menu.
      expect(screen.getAllByRole("button").map((b) => b.textContent)).toEqual([expect.stringContaining("Vi Viewer")]);
    },
    ROUTE_TEST_TIMEOUT_MS,
  );

  for (const [role, path] of [
    ["viewer", "/sensors"],
    ["viewer", "/users"],
    ["grower", "/sensors"],
    ["manager", "/users"],
    ["manager", "/mailbox"],
  ] as const) {
    it(
      `a ${role} opening ${path} is told it is not for their role, sees no edit control and nothing is asked of the API`,
      async () => {
        const api = apiFor(role);
        renderApp(path, api);
        const alert = await screen.findByRole("alert", {}, FIRST_PAINT);
        expect(within(alert).getByRole("heading", { name: "Not for your role" })).toBeTruthy();
        expect(alert.textContent).toContain(`You are signed in as ${role}`);
        expect(screen.queryAllByRole("button", { name: EDIT_CONTROLS })).toHaveLength(0);
        expect(screen.queryAllByRole("textbox")).toHaveLength(0);
        expect(api.requests.map((r) => r.path)).not.toContain(path.replace("/", "/api/").replace("mailbox", "mail"));
      },
      ROUTE_TEST_TIMEOUT_MS,
    );
  }

  it(
    "an admin gets the links to Users, Sensors and Mailbox (demo), and the sensors page has its controls",
    async () => {
      renderApp("/sensors", apiFor("admin"));
      expect(await screen.findByRole("heading", { level: 1, name: "Sensors" }, FIRST_PAINT)).toBeTruthy();
      const nav = screen.getByRole("navigation", { name: "Pages" });
      expect(within(nav).getAllByRole("link").map((l) => l.textContent)).toEqual(["Benches", "Alerts", "Walk-through", "Batches", "Reports", "Duty rota", "Settings", "Users", "Sensors", "Mailbox"]);
      expect(within(nav).getByRole("link", { name: "Sensors" }).getAttribute("aria-current")).toBe("page");
      expect(screen.getByRole("button", { name: /Register and make its secret/ })).toBeTruthy();
      expect(screen.getByRole("button", { name: "New secret for probe-1" })).toBeTruthy();
    },
    ROUTE_TEST_TIMEOUT_MS,
  );
});

describe("<Authorized>", () => {
  function renderAs(role: Role) {
    return render(
      <AuthorizationProvider user={USERS[role]}>
        <Authorized roles={ALLOWED.manageGrowing} fallback={<p>Read only</p>}>
          <button type="button">Edit window</button>
        </Authorized>
        <Authorized roles={ALLOWED.manageSensors}>
          <button type="button">Register sensor</button>
        </Authorized>
      </AuthorizationProvider>,
    );
  }

  it.each([
    ["viewer", false, false],
    ["grower", false, false],
    ["manager", true, false],
    ["admin", true, true],
  ] as const)("for a %s: manager-only control shown %s, admin-only control shown %s", (role, hasManagerControl, hasAdminControl) => {
    renderAs(role);
    expect(screen.queryByRole("button", { name: "Edit window" }) !== null).toBe(hasManagerControl);
    expect(screen.queryByText("Read only") !== null).toBe(!hasManagerControl);
    expect(screen.queryByRole("button", { name: "Register sensor" }) !== null).toBe(hasAdminControl);
  });
});
