import { fireEvent, screen, within } from "@testing-library/react";
import { beforeEach, describe, expect, it, vi } from "vitest";
import { NOW_MS, USERS, makeSession, makeZones } from "../../../testing/data";
import { createApiFake } from "../../../testing/fakes";
import { FIRST_PAINT, ROUTE_TEST_TIMEOUT_MS, renderApp } from "../../../testing/render-app";

const LINK = "http://localhost:8080/set-password?token=abc.def-123";

describe("mailbox page", () => {
  beforeEach(() => vi.setSystemTime(NOW_MS + 30_000));

  it(
    "lists the caught mail and opens a message whose links can be followed",
    async () => {
      const api = createApiFake({
        "GET /api/session": { body: makeSession(USERS.admin) },
        "GET /api/zones": { body: makeZones() },
        "GET /api/mail": {
          body: {
            messages: [
              {
                id: 2,
                receivedAtMs: NOW_MS,
                from: "Benchwarden <benchwarden@localhost>",
                to: ["pat@nursery.test"],
                subject: "You are invited to Benchwarden",
                text: `Hello Pat,\n\nSet your password here: ${LINK}.\n`,
              },
              { id: 1, receivedAtMs: NOW_MS - 3_600_000, from: "b@localhost", to: ["x@nursery.test"], subject: "Older", text: "No links." },
            ],
          },
        },
      });
      renderApp("/mailbox", api);

      expect(await screen.findByRole("heading", { name: "2 messages" }, FIRST_PAINT)).toBeTruthy();
      fireEvent.click(screen.getByRole("link", { name: /You are invited to Benchwarden/ }));

      const message = await screen.findByRole("article", { name: "You are invited to Benchwarden" });
      expect(message.textContent).toContain("pat@nursery.test");
      const link = within(message).getByRole("link", { name: LINK });
      expect(link.getAttribute("href")).toBe(LINK);
      expect(message.textContent).toContain(`${LINK}.`);
    },
    ROUTE_TEST_TIMEOUT_MS,
  );

  it(
    "says plainly when nothing was caught",
    async () => {
      const api = createApiFake({
        "GET /api/session": { body: makeSession(USERS.admin) },
        "GET /api/zones": { body: makeZones() },
        "GET /api/mail": { body: { messages: [] } },
      });
      renderApp("/mailbox", api);
      expect(await screen.findByText(/No mail yet/, {}, FIRST_PAINT)).toBeTruthy();
    },
    ROUTE_TEST_TIMEOUT_MS,
  );
});
