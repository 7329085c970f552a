import { act, fireEvent, screen, waitFor, within } from "@testing-library/react";
import { beforeEach, describe, expect, it, vi } from "vitest";
import { TEMPERATURE_UNIT_STORAGE_KEY } from "../../lib/temperature-unit";
import { NOW_MS, USERS, makeBench, makeSession, makeZone, makeZones, reading } from "../../testing/data";
import { SIGN_IN_REQUIRED, createApiFake, problem } from "../../testing/fakes";
import { FIRST_PAINT, ROUTE_TEST_TIMEOUT_MS, renderApp } from "../../testing/render-app";

const ZONES = makeZones([
  makeZone({
    benches: [makeBench({ id: 1, name: "Bench 1" }), makeBench({ id: 2, name: "Bench 2", latest: [reading("air.temperature", 24, "inside")] })],
  }),
]);

const READINGS = {
  bench: { id: 2, name: "Bench 2", zoneId: 1, zoneName: "Fig house" },
  fromMs: NOW_MS - 86_400_000,
  toMs: NOW_MS,
  bucketMs: 300_000,
  windows: [],
  series: [],
};

describe("session", () => {
  beforeEach(() => {
    vi.setSystemTime(NOW_MS + 30_000);
  });

  it(
    "on reload without a session, sends to sign-in with the page as next, and back to it after signing in",
    async () => {
      const api = createApiFake({
        "GET /api/session": SIGN_IN_REQUIRED,
        "GET /api/zones": SIGN_IN_REQUIRED,
        "GET /api/benches/2/readings": SIGN_IN_REQUIRED,
        "POST /api/session": { body: makeSession(USERS.grower) },
      });
      const app = renderApp("/benches/2", api);

      expect(await screen.findByRole("heading", { level: 1, name: "Sign in" }, FIRST_PAINT)).toBeTruthy();
      expect(app.location()).toBe("/sign-in?next=%2Fbenches%2F2");
      expect(screen.getByText(/Sign in to continue/)).toBeTruthy();

      // Signed in: the API now answers.
      api.routes["GET /api/zones"] = { body: ZONES };
      api.routes["GET /api/benches/2/readings"] = { body: READINGS };
      fireEvent.change(screen.getByLabelText("E-mail"), { target: { value: "grower@nursery.test" } });
      fireEvent.change(screen.getByLabelText("Password"), { target: { value: "bench-demo-2026" } });
      fireEvent.click(screen.getByRole("button", { name: "Sign in" }));

      expect(await screen.findByRole("heading", { level: 1, name: "Bench 2" }, FIRST_PAINT)).toBeTruthy();
      expect(app.location()).toBe("/benches/2");
      expect(screen.getByRole("button", { name: /Gil Grower/ })).toBeTruthy();
    },
    ROUTE_TEST_TIMEOUT_MS,
  );

  it(
    "restores the session from the cookie on reload (GET /api/session) without asking to sign in",
    async () => {
      const api = createApiFake({ "GET /api/session": { body: makeSession(USERS.viewer) }, "GET /api/zones": { body: ZONES } });
      const app = renderApp("/", api);
      expect(await screen.findByRole("heading", { name: "Fig house" }, FIRST_PAINT)).toBeTruthy();
      expect(app.location()).toBe("/");
      expect(api.sent("GET /api/session")).toHaveLength(1);
    },
    ROUTE_TEST_TIMEOUT_MS,
  );

  it(
    "a 401 from any query after the page is shown sends to sign-in, keeping the page as next",
    async () => {
      const api = createApiFake({
        "GET /api/session": { body: makeSession(USERS.viewer) },
        "GET /api/zones": { body: ZONES },
        "GET /api/benches/2/readings": { body: READINGS },
      });
      const app = renderApp("/benches/2", api);
      expect(await screen.findByRole("heading", { level: 1, name: "Bench 2" }, FIRST_PAINT)).toBeTruthy();

      // The session ran out on the server; the next background refresh of the chart hears 401.
      api.routes["GET /api/benches/2/readings"] = SIGN_IN_REQUIRED;
      api.routes["GET /api/session"] = SIGN_IN_REQUIRED;
      await act(() => app.queryClient.invalidateQueries({ queryKey: ["readings"] }));

      expect(await screen.findByRole("heading", { level: 1, name: "Sign in" }, FIRST_PAINT)).toBeTruthy();
      expect(app.location()).toBe("/sign-in?next=%2Fbenches%2F2");
    },
    ROUTE_TEST_TIMEOUT_MS,
  );

  it(
    "a 401 while opening another page sends to sign-in with that page as next",
    async () => {
      const api = createApiFake({ "GET /api/session": { body: makeSession(USERS.viewer) }, "GET /api/zones": { body: ZONES } });
      const app = renderApp("/", api);
      expect(await screen.findByRole("heading", { name: "Fig house" }, FIRST_PAINT)).toBeTruthy();

      api.routes["GET /api/benches/2/readings"] = SIGN_IN_REQUIRED;
      api.routes["GET /api/session"] = SIGN_IN_REQUIRED;
      await act(() => app.router.navigate("/benches/2"));

      expect(await screen.findByRole("heading", { level: 1, name: "Sign in" }, FIRST_PAINT)).toBeTruthy();
      expect(app.location()).toBe("/sign-in?next=%2Fbenches%2F2");
    },
    ROUTE_TEST_TIMEOUT_MS,
  );

  it(
    "the user's saved unit replaces this browser's default, and a change is saved with PATCH /api/me",
    async () => {
      window.localStorage.setItem(TEMPERATURE_UNIT_STORAGE_KEY, "F");
      const celsiusUser = { ...USERS.grower, temperatureUnit: "C" as const };
      const api = createApiFake({
        "GET /api/session": { body: makeSession(celsiusUser) },
        "GET /api/zones": { body: ZONES },
        "PATCH /api/me": ({ body }) => ({ body: { user: { ...celsiusUser, ...(body as object) } } }),
      });
      renderApp("/", api);

      const card = (await screen.findAllByRole("article", {}, FIRST_PAINT))[1]!;
      expect(within(card).getByRole("group", { name: "Air temperature" }).textContent).toContain("24.0 °C");
      await waitFor(() => expect(window.localStorage.getItem(TEMPERATURE_UNIT_STORAGE_KEY)).toBe("C"));

      fireEvent.click(screen.getByRole("button", { name: /your account/ }));
      expect(screen.getByText("grower@nursery.test")).toBeTruthy();
      fireEvent.click(screen.getByRole("button", { name: "°F" }));

      await waitFor(() => expect(within(card).getByRole("group", { name: "Air temperature" }).textContent).toContain("75.2 °F"));
      expect(api.sent("PATCH /api/me").map((r) => r.body)).toEqual([{ temperatureUnit: "F" }]);
      expect(window.localStorage.getItem(TEMPERATURE_UNIT_STORAGE_KEY)).toBe("F");
    },
    ROUTE_TEST_TIMEOUT_MS,
  );

  it(
    "when the server refuses the unit, the shown unit goes back and a message says so",
    async () => {
      const api = createApiFake({
        "GET /api/session": { body: makeSession(USERS.grower) },
        "GET /api/zones": { body: ZONES },
        "PATCH /api/me": problem(500, "internal-error", "Something went wrong on the server; it has been logged"),
      });
      renderApp("/", api);
      const card = (await screen.findAllByRole("article", {}, FIRST_PAINT))[1]!;

      fireEvent.click(screen.getByRole("button", { name: /your account/ }));
      fireEvent.click(screen.getByRole("button", { name: "°C" }));

      expect((await screen.findByRole("alert")).textContent).toContain("Your temperature unit was not saved");
      expect(within(card).getByRole("group", { name: "Air temperature" }).textContent).toContain("75.2 °F");
    },
    ROUTE_TEST_TIMEOUT_MS,
  );

  it(
    "sign-out ends the session on the server and shows the sign-in page",
    async () => {
      const api = createApiFake({
        "GET /api/session": { body: makeSession(USERS.viewer) },
        "GET /api/zones": { body: ZONES },
        "DELETE /api/session": { status: 204 },
      });
      const app = renderApp("/", api);
      expect(await screen.findByRole("heading", { name: "Fig house" }, FIRST_PAINT)).toBeTruthy();

      api.routes["GET /api/session"] = SIGN_IN_REQUIRED;
      fireEvent.click(screen.getByRole("button", { name: /your account/ }));
      fireEvent.click(screen.getByRole("button", { name: "Sign out" }));

      expect(await screen.findByRole("heading", { level: 1, name: "Sign in" }, FIRST_PAINT)).toBeTruthy();
      expect(api.sent("DELETE /api/session")).toHaveLength(1);
      expect(app.location()).toBe("/sign-in");
      expect(app.queryClient.getQueryData(["zones", "list"])).toBeUndefined();
    },
    ROUTE_TEST_TIMEOUT_MS,
  );
});
