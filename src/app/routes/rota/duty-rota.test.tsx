import { fireEvent, screen, waitFor, within } from "@testing-library/react";
import { beforeEach, describe, expect, it, vi } from "vitest";
import type { Role } from "../../../../shared/schemas/auth.js";
import { NOW_MS, USERS, makeSession, makeZones } from "../../../testing/data";
import { createApiFake, problem } from "../../../testing/fakes";
import { FIRST_PAINT, ROUTE_TEST_TIMEOUT_MS, renderApp } from "../../../testing/render-app";

const ROTA = {
  timeZone: "America/Chicago",
  shifts: [
    { id: 1, zoneId: 1, zoneName: "Fig house", userId: 3, userName: "Gil Grower", weekdays: 0b0111110, startMinute: 18 * 60, endMinute: 7 * 60, isFallback: false },
    { id: 2, zoneId: null, zoneName: null, userId: 2, userName: "Mo Manager", weekdays: 0b1111111, startMinute: 0, endMinute: 1440, isFallback: true },
  ],
  onDutyNow: [
    { zoneId: 1, zoneName: "Fig house", users: [{ id: 3, name: "Gil Grower" }] },
    { zoneId: 2, zoneName: "Graft house", users: [{ id: 2, name: "Mo Manager" }] },
  ],
  alertTiming: [
    // Its own escalation time; reminders at the server's default.
    { siteId: 4, siteName: "Hillside Propagation", escalateAfterS: 45 * 60, renotifyEveryS: null, defaultEscalateAfterS: 20 * 60, defaultRenotifyEveryS: 30 * 60 },
  ],
};

function apiFor(role: Role) {
  return createApiFake({
    "GET /api/session": { body: makeSession(USERS[role]) },
    "GET /api/zones": { body: makeZones() },
    "GET /api/duty-rota": { body: ROTA },
    "GET /api/duty-rota/candidates":
      role === "admin" || role === "manager"
        ? { body: { users: Object.values(USERS).flatMap((u) => (u.role === "viewer" ? [] : [{ id: u.id, name: u.name, role: u.role as "admin" | "manager" | "grower" }])) } }
        : problem(403, "forbidden"),
  });
}

function shiftRow(name: RegExp) {
  return screen.getAllByRole("row").find((r) => name.test(r.textContent ?? ""))!;
}

describe("duty rota page", () => {
  beforeEach(() => vi.setSystemTime(NOW_MS + 30_000));

  it(
    "lists the shifts in the site's time and who is on duty now; a viewer gets no edit control",
    async () => {
      const api = apiFor("viewer");
      renderApp("/duty-rota", api);
      expect(await screen.findByRole("heading", { level: 1, name: "Duty rota" }, FIRST_PAINT)).toBeTruthy();
      const onDuty = screen.getByRole("region", { name: "On duty now" });
      expect(onDuty.textContent).toContain("Fig house");
      expect(onDuty.textContent).toContain("Gil Grower");
      const night = shiftRow(/Gil Grower/);
      expect(night.textContent).toContain("Mon–Fri");
      expect(night.textContent).toMatch(/6:00\sPM – 7:00\sAM next day/);
      const fallback = shiftRow(/Mo Manager/);
      expect(fallback.textContent).toContain("Every zone");
      expect(fallback.textContent).toContain("Every day");
      expect(fallback.textContent).toContain("All day");
      expect(fallback.textContent).toContain("Fallback");
      expect(screen.getByText(/site's local time \(America\/Chicago\)/)).toBeTruthy();
      expect(screen.queryByRole("button", { name: /Add a shift|Edit|Delete/ })).toBeNull();
      expect(api.requests.map((r) => r.path)).not.toContain("/api/duty-rota/candidates");
    },
    ROUTE_TEST_TIMEOUT_MS,
  );

  it(
    "a manager's new shift is checked with the shared schema before anything is sent, then saved",
    async () => {
      const api = apiFor("manager");
      api.routes["POST /api/duty-rota/shifts"] = { status: 201, body: { shift: { ...ROTA.shifts[0], id: 3 } } };
      renderApp("/duty-rota", api);
      fireEvent.click(await screen.findByRole("button", { name: "Add a shift" }, FIRST_PAINT));
      const form = screen.getByRole("form", { name: "Add a shift" });

      // Nobody chosen, no day ticked, and (checked once those are fixed) start = end.
      for (const day of ["Monday", "Tuesday", "Wednesday", "Thursday", "Friday", "Saturday", "Sunday"]) {
        fireEvent.click(within(form).getByRole("checkbox", { name: day }));
      }
      fireEvent.change(within(form).getByLabelText("From"), { target: { value: "22:00" } });
      fireEvent.change(within(form).getByLabelText("To"), { target: { value: "22:00" } });
      fireEvent.click(within(form).getByRole("button", { name: "Add shift" }));

      expect(await within(form).findByText("Choose who is on duty")).toBeTruthy();
      expect(within(form).getByText("Choose at least one day")).toBeTruthy();
      expect(api.sent("POST /api/duty-rota/shifts")).toHaveLength(0);

      // A manager gets everyone who can acknowledge from /api/duty-rota/candidates (no viewers).
      const who = within(form).getByRole("combobox", { name: /Who/ });
      expect(within(who).getAllByRole("option").map((o) => o.textContent)).toEqual(["Choose a person…", "Ada Admin", "Mo Manager", "Gil Grower"]);
      fireEvent.change(who, { target: { value: "3" } });
      fireEvent.change(within(form).getByRole("combobox", { name: "Zone" }), { target: { value: "2" } });
      fireEvent.click(within(form).getByRole("button", { name: "Weekend" }));
      fireEvent.click(within(form).getByRole("button", { name: "Add shift" }));
      // The schema's whole-shift rule: a regular shift cannot start and end at the same minute.
      expect(await within(form).findByText("A shift needs a start and an end")).toBeTruthy();
      expect(within(form).queryByText("Choose at least one day")).toBeNull();
      expect(api.sent("POST /api/duty-rota/shifts")).toHaveLength(0);

      fireEvent.change(within(form).getByLabelText("To"), { target: { value: "06:30" } });
      fireEvent.click(within(form).getByRole("button", { name: "Add shift" }));

      await waitFor(() => expect(api.sent("POST /api/duty-rota/shifts")).toHaveLength(1));
      expect(api.sent("POST /api/duty-rota/shifts")[0]?.body).toEqual({
        zoneId: 2,
        userId: 3,
        weekdays: 0b1000001,
        startMinute: 22 * 60,
        endMinute: 6 * 60 + 30,
        isFallback: false,
      });
      await waitFor(() => expect(screen.queryByRole("form", { name: "Add a shift" })).toBeNull());
    },
    ROUTE_TEST_TIMEOUT_MS,
  );

  it(
    "an admin picks from every active person who can acknowledge, and the server's refusal lands on the field",
    async () => {
      const api = apiFor("admin");
      api.routes["PUT /api/duty-rota/shifts/1"] = problem(400, "viewer-cannot-be-on-duty", "A viewer cannot acknowledge", [
        { path: "userId", message: "Viewers cannot acknowledge alerts" },
      ]);
      renderApp("/duty-rota", api);
      fireEvent.click(await screen.findByRole("button", { name: "Edit shift of Gil Grower" }, FIRST_PAINT));
      const form = screen.getByRole("form", { name: "Edit shift" });
      const who = within(form).getByRole("combobox", { name: /Who/ }) as HTMLSelectElement;
      expect(who.value).toBe("3");
      // Viewers cannot be on duty: not offered.
      expect(within(who).getAllByRole("option").map((o) => o.textContent)).toEqual(["Choose a person…", "Ada Admin", "Mo Manager", "Gil Grower"]);
      fireEvent.click(within(form).getByRole("button", { name: "Save shift" }));
      expect(await within(form).findByText("Viewers cannot acknowledge alerts")).toBeTruthy();
      expect(api.sent("PUT /api/duty-rota/shifts/1")[0]?.body).toMatchObject({ userId: 3, weekdays: 0b0111110, startMinute: 1080, endMinute: 420 });
    },
    ROUTE_TEST_TIMEOUT_MS,
  );

  it(
    "deleting asks first and then sends DELETE",
    async () => {
      const api = apiFor("manager");
      api.routes["DELETE /api/duty-rota/shifts/2"] = { status: 204 };
      renderApp("/duty-rota", api);
      fireEvent.click(await screen.findByRole("button", { name: "Delete shift of Mo Manager" }, FIRST_PAINT));
      const dialog = screen.getByRole("dialog", { name: "Delete this shift?" });
      expect(api.sent("DELETE /api/duty-rota/shifts/2")).toHaveLength(0);
      fireEvent.click(within(dialog).getByRole("button", { name: "Delete shift" }));
      await waitFor(() => expect(api.sent("DELETE /api/duty-rota/shifts/2")).toHaveLength(1));
    },
    ROUTE_TEST_TIMEOUT_MS,
  );

  it(
    "a grower reads when the managers are told and how often the person on duty is reminded, with no form",
    async () => {
      const api = apiFor("grower");
      renderApp("/duty-rota", api);
      const section = await screen.findByRole("region", { name: "When nobody acknowledges" }, FIRST_PAINT);
      expect(section.textContent).toContain("Hillside Propagation");
      expect(section.textContent).toContain("The managers are told after 45 minutes.");
      expect(section.textContent).toContain("The person on duty is reminded every 30 minutes (the default).");
      expect(section.textContent).toContain("Only managers and admins change these times.");
      expect(within(section).queryByRole("textbox")).toBeNull();
      expect(within(section).queryByRole("button")).toBeNull();
    },
    ROUTE_TEST_TIMEOUT_MS,
  );

  it(
    "a manager's alert times are checked with the shared schema before sending; empty means the default; the server's refusal lands on its field",
    async () => {
      const api = apiFor("manager");
      renderApp("/duty-rota", api);
      const form = await screen.findByRole("form", { name: "When nobody acknowledges at Hillside Propagation" }, FIRST_PAINT);
      const managers = within(form).getByRole("textbox", { name: "Tell the managers after" }) as HTMLInputElement;
      const reminders = within(form).getByRole("textbox", { name: "Remind the person on duty every" }) as HTMLInputElement;
      // The site's own 45 minutes; reminders empty (the default), which the hint names.
      expect(managers.value).toBe("45");
      expect(reminders.value).toBe("");
      expect(form.textContent).toContain("Leave empty for the default, 30 minutes. From 10 minutes to 12 hours.");

      // Below the bounds, above them, part of a minute, not a number: refused here, nothing sent.
      fireEvent.change(managers, { target: { value: "2" } });
      fireEvent.change(reminders, { target: { value: "800" } });
      fireEvent.click(within(form).getByRole("button", { name: "Save times" }));
      expect(await within(form).findByText("Choose between 5 minutes and 12 hours")).toBeTruthy();
      expect(within(form).getByText("Choose between 10 minutes and 12 hours")).toBeTruthy();
      expect(managers.getAttribute("aria-invalid")).toBe("true");
      fireEvent.change(managers, { target: { value: "7.5" } });
      fireEvent.change(reminders, { target: { value: "half an hour" } });
      fireEvent.click(within(form).getByRole("button", { name: "Save times" }));
      expect(await within(form).findByText("Use whole minutes")).toBeTruthy();
      expect(within(form).getByText("Enter a number of minutes")).toBeTruthy();
      expect(api.sent("PUT /api/sites/4/alert-timing")).toHaveLength(0);

      // The server may still refuse: its field issue lands on the field.
      api.routes["PUT /api/sites/4/alert-timing"] = problem(400, "invalid-input", "Some fields are not valid", [
        { path: "escalateAfterS", message: "Choose between 5 minutes and 12 hours" },
      ]);
      fireEvent.change(managers, { target: { value: "15" } });
      fireEvent.change(reminders, { target: { value: "" } });
      fireEvent.click(within(form).getByRole("button", { name: "Save times" }));
      await waitFor(() => expect(api.sent("PUT /api/sites/4/alert-timing")).toHaveLength(1));
      expect(api.sent("PUT /api/sites/4/alert-timing")[0]?.body).toEqual({ escalateAfterS: 15 * 60, renotifyEveryS: null });
      expect(await within(form).findByText("Choose between 5 minutes and 12 hours")).toBeTruthy();
      expect(within(form).queryByText("Enter a number of minutes")).toBeNull();

      api.routes["PUT /api/sites/4/alert-timing"] = {
        body: { alertTiming: { ...ROTA.alertTiming[0], escalateAfterS: 15 * 60, renotifyEveryS: null } },
      };
      fireEvent.click(within(form).getByRole("button", { name: "Save times" }));
      await waitFor(() => expect(api.sent("PUT /api/sites/4/alert-timing")).toHaveLength(2));
      await waitFor(() => expect(within(form).queryByText("Choose between 5 minutes and 12 hours")).toBeNull());
      expect(await screen.findByText("Saved for Hillside Propagation")).toBeTruthy();
    },
    ROUTE_TEST_TIMEOUT_MS,
  );
});
