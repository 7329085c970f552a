import { fireEvent, screen, within } from "@testing-library/react";
import { beforeEach, describe, expect, it, vi } from "vitest";
import { NOW_MS, makeAlert } from "../../../testing/data";
import { createApiFake, problem } from "../../../testing/fakes";
import { FIRST_PAINT, ROUTE_TEST_TIMEOUT_MS, renderApp } from "../../../testing/render-app";

const TOKEN = "ack.tok-1234567890";
const LINK_PATH = `/api/ack-links/${encodeURIComponent(TOKEN)}`;
const PAGE = `/ack?token=${encodeURIComponent(TOKEN)}`;

const RAISED = [
  makeAlert({ id: 7, benchId: 3, benchName: "Bench 3", lastValue: 15 }),
  makeAlert({ id: 8, benchId: 4, benchName: "Bench 4", lastValue: 16, worstValue: 15.5 }),
];
const LINK = { recipientName: "Marisol Night", expiresAtMs: NOW_MS + 86_400_000, alerts: RAISED, canAcknowledge: true };
const ACKNOWLEDGED = {
  ...LINK,
  canAcknowledge: false,
  alerts: RAISED.map((a) => ({ ...a, phase: "acknowledged" as const, acknowledgedAtMs: NOW_MS + 20_000, acknowledgedByName: "Marisol Night" })),
};

describe("acknowledge page (/ack)", () => {
  beforeEach(() => vi.setSystemTime(NOW_MS + 30_000));

  it(
    "shows the link's alerts signed out and acknowledges nothing on opening; one tap acknowledges and confirms who",
    async () => {
      const api = createApiFake({ [`GET ${LINK_PATH}`]: { body: LINK }, [`POST ${LINK_PATH}`]: { body: ACKNOWLEDGED } });
      renderApp(PAGE, api);

      const list = await screen.findByRole("list", { name: "Alerts in this e-mail" }, FIRST_PAINT);
      expect(within(list).getAllByRole("article")).toHaveLength(2);
      expect(list.textContent).toContain("Bench 3");
      expect(list.textContent).toContain("Air too cold");
      // 15 °C in the browser's default unit (°F), with the window it left.
      expect(list.textContent).toContain("59.0 °F");
      expect(list.textContent).toContain("Window 69.8–80.6 °F");
      expect(screen.getByText("Marisol Night")).toBeTruthy();
      // Opening the page only read the link: no session asked for, nothing sent.
      expect(api.requests.map((r) => `${r.method} ${r.path}`)).toEqual([`GET ${LINK_PATH}`]);

      // One big tap target.
      const button = screen.getByRole("button", { name: "I've got it" });
      expect(button.className).toContain("py-5");
      fireEvent.click(button);

      const confirmation = await screen.findByText("Got it: acknowledged");
      expect(confirmation.parentElement?.textContent).toContain("2 alerts are acknowledged by Marisol Night");
      expect(api.sent(`POST ${LINK_PATH}`)).toHaveLength(1);
      expect(api.sent(`POST ${LINK_PATH}`)[0]?.body).toEqual({});
      const done = screen.getByRole("list", { name: "Acknowledged alerts" });
      expect(within(done).getAllByText(/Acknowledged by/)).toHaveLength(2);
      expect(screen.queryByRole("button", { name: "I've got it" })).toBeNull();
    },
    ROUTE_TEST_TIMEOUT_MS,
  );

  it(
    "puts the alerts still waiting above the button and the ones already over below it; the confirmation names what was taken",
    async () => {
      const cleared = makeAlert({ id: 9, kind: "sensor-silent", quantity: null, direction: null, sensorId: "h1-b2-air", lastValue: null, phase: "cleared", clearedAtMs: NOW_MS, summary: "Sensor h1-b2-air silent" });
      const mixed = { ...LINK, alerts: [cleared, RAISED[0]!] };
      const answer = { ...mixed, canAcknowledge: false, alerts: [cleared, { ...ACKNOWLEDGED.alerts[0]! }] };
      const api = createApiFake({ [`GET ${LINK_PATH}`]: { body: mixed }, [`POST ${LINK_PATH}`]: { body: answer } });
      renderApp(PAGE, api);
      const waiting = await screen.findByRole("list", { name: "Alerts in this e-mail" }, FIRST_PAINT);
      expect(within(waiting).getAllByRole("article").map((a) => a.getAttribute("data-alert-id"))).toEqual(["7"]);
      const over = screen.getByRole("list", { name: "Alerts no longer waiting" });
      expect(over.textContent).toContain("Readings arriving again");
      expect(screen.getByText(/One tap acknowledges this alert as Marisol Night/)).toBeTruthy();

      fireEvent.click(screen.getByRole("button", { name: "I've got it" }));
      const confirmation = await screen.findByText("Got it: acknowledged");
      expect(confirmation.parentElement?.textContent).toContain("Air too cold on Bench 3 is acknowledged by Marisol Night");
    },
    ROUTE_TEST_TIMEOUT_MS,
  );

  it(
    "sends the optional note with the tap",
    async () => {
      const api = createApiFake({ [`GET ${LINK_PATH}`]: { body: LINK }, [`POST ${LINK_PATH}`]: { body: ACKNOWLEDGED } });
      renderApp(PAGE, api);
      fireEvent.click(await screen.findByRole("button", { name: "+ Add a note" }, FIRST_PAINT));
      fireEvent.change(screen.getByLabelText("Note (optional)"), { target: { value: "  Heater 2 reset, checking at 4  " } });
      fireEvent.click(screen.getByRole("button", { name: "I've got it" }));
      expect(await screen.findByText("Got it: acknowledged")).toBeTruthy();
      // Trimmed by the shared schema before sending.
      expect(api.sent(`POST ${LINK_PATH}`)[0]?.body).toEqual({ note: "Heater 2 reset, checking at 4" });
    },
    ROUTE_TEST_TIMEOUT_MS,
  );

  it(
    "a link someone already used shows who took it and changes nothing",
    async () => {
      const taken = {
        ...LINK,
        canAcknowledge: false,
        alerts: RAISED.map((a) => ({ ...a, phase: "acknowledged" as const, acknowledgedAtMs: NOW_MS, acknowledgedByName: "Gil Grower" })),
      };
      // The page was opened while still raised; meanwhile Gil took it from the dashboard.
      const api = createApiFake({
        [`GET ${LINK_PATH}`]: { body: LINK },
        [`POST ${LINK_PATH}`]: problem(410, "already-acknowledged", "Already acknowledged by Gil Grower"),
      });
      renderApp(PAGE, api);
      const button = await screen.findByRole("button", { name: "I've got it" }, FIRST_PAINT);
      api.routes[`GET ${LINK_PATH}`] = { body: taken };
      fireEvent.click(button);

      const refusal = await screen.findByText("Someone already has it");
      expect(refusal.parentElement?.textContent).toContain("Already acknowledged by Gil Grower");
      expect(screen.queryByText("Got it: acknowledged")).toBeNull();
      // The link is read again to show the alerts as they are now.
      expect((await screen.findAllByText(/Acknowledged by/)).length).toBe(2);
      expect(screen.queryByRole("button", { name: "I've got it" })).toBeNull();
    },
    ROUTE_TEST_TIMEOUT_MS,
  );

  it(
    "a link opened after it was used says nothing is left, with no button",
    async () => {
      const taken = { ...ACKNOWLEDGED, alerts: ACKNOWLEDGED.alerts.map((a) => ({ ...a, acknowledgedByName: "Gil Grower" })) };
      const api = createApiFake({ [`GET ${LINK_PATH}`]: { body: taken } });
      renderApp(PAGE, api);
      const notice = await screen.findByText("Nothing left to acknowledge", {}, FIRST_PAINT);
      expect(notice.parentElement?.textContent).toContain("Already acknowledged by Gil Grower");
      expect(screen.queryByRole("button", { name: "I've got it" })).toBeNull();
      expect(api.requests.map((r) => r.method)).toEqual(["GET"]);
    },
    ROUTE_TEST_TIMEOUT_MS,
  );

  it(
    "an expired link says so and offers the signed-in way",
    async () => {
      const api = createApiFake({ [`GET ${LINK_PATH}`]: problem(410, "link-not-valid", "This acknowledge link has expired or is not valid.") });
      renderApp(PAGE, api);
      const alert = await screen.findByRole("alert", {}, FIRST_PAINT);
      expect(alert.textContent).toContain("This link can't be used");
      expect(screen.getByRole("link", { name: "Open the alerts page" }).getAttribute("href")).toBe("/alerts");
      expect(screen.queryByRole("button", { name: "I've got it" })).toBeNull();
    },
    ROUTE_TEST_TIMEOUT_MS,
  );
});
