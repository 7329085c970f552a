import { screen, waitFor, within } from "@testing-library/react";
import { beforeEach, describe, expect, it, vi } from "vitest";
import { NOW_MS, USERS, makeSession, makeZones } from "../../testing/data";
import { createApiFake } from "../../testing/fakes";
import { FIRST_PAINT, ROUTE_TEST_TIMEOUT_MS, renderApp } from "../../testing/render-app";

function navLinks() {
  return within(screen.getByRole("navigation", { name: "Pages" }))
    .getAllByRole("link")
    .map((l) => l.getAttribute("href"));
}

describe("the Mailbox link", () => {
  beforeEach(() => vi.setSystemTime(NOW_MS + 30_000));

  it(
    "outside demo mode an admin gets no Mailbox link while the sink has caught nothing, and the mailbox is asked once",
    async () => {
      const api = createApiFake({
        "GET /api/session": { body: { ...makeSession(USERS.admin), demo: false } },
        "GET /api/zones": { body: makeZones() },
        "GET /api/mail": { body: { messages: [] } },
      });
      renderApp("/", api);
      await screen.findByRole("heading", { name: "Fig house" }, FIRST_PAINT);
      await waitFor(() => expect(api.sent("GET /api/mail")).toHaveLength(1));
      expect(navLinks()).not.toContain("/mailbox");
      expect(navLinks()).toContain("/users");
    },
    ROUTE_TEST_TIMEOUT_MS,
  );

  it(
    "outside demo mode, caught mail brings the link back",
    async () => {
      const api = createApiFake({
        "GET /api/session": { body: { ...makeSession(USERS.admin), demo: false } },
        "GET /api/zones": { body: makeZones() },
        "GET /api/mail": { body: { messages: [{ id: 1, receivedAtMs: NOW_MS, from: "b@localhost", to: ["x@nursery.test"], subject: "Hi", text: "…" }] } },
      });
      renderApp("/", api);
      await screen.findByRole("heading", { name: "Fig house" }, FIRST_PAINT);
      await waitFor(() => expect(navLinks()).toContain("/mailbox"));
    },
    ROUTE_TEST_TIMEOUT_MS,
  );

  it(
    "in demo mode it is there without asking the mailbox first",
    async () => {
      const api = createApiFake({ "GET /api/session": { body: makeSession(USERS.admin) }, "GET /api/zones": { body: makeZones() } });
      renderApp("/", api);
      await screen.findByRole("heading", { name: "Fig house" }, FIRST_PAINT);
      expect(navLinks()).toContain("/mailbox");
      expect(api.sent("GET /api/mail")).toHaveLength(0);
    },
    ROUTE_TEST_TIMEOUT_MS,
  );
});
