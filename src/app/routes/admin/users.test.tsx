import { fireEvent, screen, waitFor, within } from "@testing-library/react";
import { beforeEach, describe, expect, it, vi } from "vitest";
import { NOW_MS, USERS, makeSession, makeUser, makeZones } from "../../../testing/data";
import { createApiFake, problem } from "../../../testing/fakes";
import { FIRST_PAINT, ROUTE_TEST_TIMEOUT_MS, renderApp } from "../../../testing/render-app";

const INVITED = makeUser({ id: 7, name: "Ines New", email: "ines@nursery.test", role: "grower", hasPassword: false, lastSignInMs: null });

function usersApi() {
  return createApiFake({
    "GET /api/session": { body: makeSession(USERS.admin) },
    "GET /api/zones": { body: makeZones() },
    "GET /api/users": { body: { users: [...Object.values(USERS), INVITED] } },
    "PATCH /api/users/1": problem(409, "last-admin", "This is the only active admin; make someone else admin first"),
    "PATCH /api/users/3": ({ body }) => ({ body: { user: { ...USERS.grower, ...(body as object) } } }),
    "POST /api/users": ({ body }) =>
      (body as { email: string }).email === "grower@nursery.test"
        ? problem(409, "email-taken", "grower@nursery.test already has an account")
        : { status: 201, body: { user: makeUser({ id: 9, ...(body as object), hasPassword: false }) } },
  });
}

describe("users page", () => {
  beforeEach(() => vi.setSystemTime(NOW_MS + 30_000));

  it(
    "lists accounts with role and state; the admin's own row offers no disable",
    async () => {
      renderApp("/users", usersApi());
      const me = await screen.findByRole("row", { name: /Ada Admin/ }, FIRST_PAINT);
      expect(me.textContent).toContain("you");
      expect(within(me).queryByRole("button", { name: /Disable/ })).toBeNull();
      expect(screen.getByRole("row", { name: /Ines New/ }).textContent).toContain("InvitedNo password set yet");
      expect((screen.getByRole("combobox", { name: "Role of Gil Grower" }) as HTMLSelectElement).value).toBe("grower");
    },
    ROUTE_TEST_TIMEOUT_MS,
  );

  it(
    "changes someone's role at once, and shows the server's last-admin refusal on the admin's own row",
    async () => {
      const api = usersApi();
      renderApp("/users", api);
      await screen.findByRole("row", { name: /Ada Admin/ }, FIRST_PAINT);

      fireEvent.change(screen.getByRole("combobox", { name: "Role of Gil Grower" }), { target: { value: "manager" } });
      expect(await screen.findByText("Gil Grower is now manager")).toBeTruthy();
      expect(api.sent("PATCH /api/users/3")[0]?.body).toEqual({ role: "manager" });

      // Demoting yourself asks first; the server then refuses: the only admin.
      fireEvent.change(screen.getByRole("combobox", { name: "Role of Ada Admin" }), { target: { value: "viewer" } });
      const confirm = screen.getByRole("dialog", { name: "Change your own role to viewer?" });
      fireEvent.click(within(confirm).getByRole("button", { name: "Change my role" }));

      const row = screen.getByRole("row", { name: /Ada Admin/ });
      expect((await within(row).findByRole("alert")).textContent).toBe("This is the only active admin; make someone else admin first");
      expect((within(row).getByRole("combobox") as HTMLSelectElement).value).toBe("admin");
    },
    ROUTE_TEST_TIMEOUT_MS,
  );

  it(
    "disabling asks first and sends disabled: true",
    async () => {
      const api = usersApi();
      renderApp("/users", api);
      const row = await screen.findByRole("row", { name: /Gil Grower/ }, FIRST_PAINT);
      fireEvent.click(within(row).getByRole("button", { name: "Disable Gil Grower" }));
      const confirm = screen.getByRole("dialog", { name: "Disable Gil Grower?" });
      expect(confirm.textContent).toContain("cannot sign in until an admin enables");
      fireEvent.click(within(confirm).getByRole("button", { name: "Disable" }));
      await waitFor(() => expect(api.sent("PATCH /api/users/3")[0]?.body).toEqual({ disabled: true }));
    },
    ROUTE_TEST_TIMEOUT_MS,
  );

  it(
    "the invite form uses the shared schema, maps email-taken onto the e-mail field, and confirms a sent invitation",
    async () => {
      const api = usersApi();
      renderApp("/users", api);
      const form = await screen.findByRole("form", { name: "Invite someone" }, FIRST_PAINT);
      const send = () => fireEvent.click(within(form).getByRole("button", { name: "Send invitation" }));

      send();
      expect(await within(form).findByText("Enter a name")).toBeTruthy();
      expect(within(form).getByText("Enter a valid e-mail address")).toBeTruthy();
      expect(api.sent("POST /api/users")).toHaveLength(0);

      fireEvent.change(within(form).getByLabelText("Name"), { target: { value: "Gil Again" } });
      fireEvent.change(within(form).getByLabelText("E-mail"), { target: { value: "grower@nursery.test" } });
      send();
      expect(await within(form).findByText("grower@nursery.test already has an account")).toBeTruthy();
      expect(within(form).getByLabelText("E-mail").getAttribute("aria-invalid")).toBe("true");

      fireEvent.change(within(form).getByLabelText("Name"), { target: { value: "Pat Propagator" } });
      fireEvent.change(within(form).getByLabelText("E-mail"), { target: { value: "Pat@Nursery.test" } });
      fireEvent.click(within(form).getByRole("radio", { name: /Grower/ }));
      send();
      expect(await within(form).findByText("Invitation sent to pat@nursery.test")).toBeTruthy();
      expect(api.sent("POST /api/users").at(-1)?.body).toEqual({ name: "Pat Propagator", email: "pat@nursery.test", role: "grower" });
      expect(within(form).getByRole("link", { name: "Mailbox" }).getAttribute("href")).toBe("/mailbox");
    },
    ROUTE_TEST_TIMEOUT_MS,
  );

  it(
    "an admin who gives up the role (another admin exists) loses the admin links and controls at once",
    async () => {
      const api = usersApi();
      const demoted = { ...USERS.admin, role: "manager" as const };
      api.routes["PATCH /api/users/1"] = { body: { user: demoted } };
      renderApp("/users", api);
      await screen.findByRole("row", { name: /Ada Admin/ }, FIRST_PAINT);

      api.routes["GET /api/session"] = { body: makeSession(demoted) };
      fireEvent.change(screen.getByRole("combobox", { name: "Role of Ada Admin" }), { target: { value: "manager" } });
      fireEvent.click(within(screen.getByRole("dialog")).getByRole("button", { name: "Change my role" }));

      expect(await screen.findByText("You are no longer an admin")).toBeTruthy();
      // Every role keeps Benches, Alerts, Duty rota and Settings; the admin pages' links are gone.
      const nav = screen.getByRole("navigation", { name: "Pages" });
      expect(within(nav).getAllByRole("link").map((l) => l.textContent)).toEqual(["Benches", "Alerts", "Walk-through", "Batches", "Reports", "Duty rota", "Settings"]);
      expect(screen.queryAllByRole("combobox")).toHaveLength(0);
      expect(screen.queryAllByRole("button", { name: /Disable|Send invitation/ })).toHaveLength(0);
    },
    ROUTE_TEST_TIMEOUT_MS,
  );
});
