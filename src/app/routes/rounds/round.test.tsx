import { onlineManager } from "@tanstack/react-query";
import { fireEvent, screen, waitFor, within } from "@testing-library/react";
import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import type { RoundSummary } from "../../../../shared/schemas/rounds.js";
import { WAITING_STORAGE_KEY } from "../../../features/offline/utils/persist-mutations";
import { NOW_MS, USERS, makeSession, makeUser } from "../../../testing/data";
import { createApiFake, type FakeRequest } from "../../../testing/fakes";
import { FIRST_PAINT, ROUTE_TEST_TIMEOUT_MS, renderApp } from "../../../testing/render-app";
import { makeCards, makeCardsResponse, makeRound, ROUND_ID, storedObservation } from "./round-fixtures";

type Body = Record<string, unknown>;

const CHECK = { atMs: NOW_MS + 60_000, by: { userId: 3, name: "Gil Grower" }, note: null };

/**
 * A fake server for one round: observations are stored once per clientId (201, then 200 with the
 * stored one), as the real one does; `isDown` makes every POST/PUT fail as a dropped connection.
 */
function roundServer(user = USERS.grower) {
  const stored = new Map<string, Body>();
  const attempts: Body[] = [];
  const checks: number[] = [];
  const api = createApiFake({
    "GET /api/session": { body: makeSession(user) },
    [`GET /api/rounds/${ROUND_ID}`]: { body: { round: makeRound() } },
    // What the server would answer now: the observations stored in this round, the check-off made.
    [`GET /api/rounds/${ROUND_ID}/cards`]: () => {
      const cards = makeCards().map((card) => ({
        ...card,
        check: card.benchId === 1 && checks.length > 0 ? CHECK : null,
        batches: card.batches.map((b) => ({ ...b, observationsThisRound: [...stored.values()].map((body, i) => storedObservation(i + 1, body)) })),
      }));
      return { body: makeCardsResponse(cards, makeRound({ checkedCount: checks.length > 0 ? 1 : 0 })) };
    },
    "POST /api/batches/11/observations": ({ body }: FakeRequest) => {
      const input = body as Body;
      const clientId = String(input.clientId);
      const created = !stored.has(clientId);
      if (created) stored.set(clientId, input);
      return { status: created ? 201 : 200, body: { observation: storedObservation(stored.size, stored.get(clientId)!), created } };
    },
    [`PUT /api/rounds/${ROUND_ID}/benches/1/check`]: () => {
      checks.push(1);
      const round = makeRound({ checkedCount: 1 });
      return { body: { bench: { ...round.benches[0]!, check: CHECK }, round } };
    },
  });
  const state = { isDown: false };
  const fetch = async (input: RequestInfo | URL, init: RequestInit = {}) => {
    const method = (init.method ?? "GET").toUpperCase();
    if (method !== "GET") {
      if (typeof init.body === "string") attempts.push(JSON.parse(init.body) as Body);
      if (state.isDown) throw new TypeError("Failed to fetch");
    }
    return api.fetch(input, init);
  };
  return { api: { ...api, fetch }, fake: api, stored, attempts, checks, state };
}

const observationButton = () => screen.findByRole("button", { name: "Record observation of Harbour Amber" }, FIRST_PAINT);
const waitingIndicator = () => screen.queryByTestId("waiting-to-send");

async function enterObservation({ stage = "Callused", flags = ["Mould"], note = "White fuzz on two bases", rooted, lost }: { stage?: string; flags?: string[]; note?: string; rooted?: string; lost?: string } = {}) {
  fireEvent.click(await observationButton());
  const form = screen.getByRole("form", { name: "Observation of Harbour Amber" });
  fireEvent.click(within(form).getByRole("radio", { name: stage }));
  for (const flag of flags) fireEvent.click(within(form).getByRole("button", { name: flag }));
  if (rooted !== undefined) fireEvent.change(within(form).getByLabelText("Rooted so far"), { target: { value: rooted } });
  if (lost !== undefined) fireEvent.change(within(form).getByLabelText("Lost so far"), { target: { value: lost } });
  fireEvent.change(within(form).getByLabelText("Note"), { target: { value: note } });
  fireEvent.click(within(form).getByRole("button", { name: "Save observation" }));
  return form;
}

function storedQueue(): { mutations: { state: { variables: { input: Body } } }[] } {
  return JSON.parse(window.localStorage.getItem(WAITING_STORAGE_KEY) ?? '{"mutations":[]}') as never;
}

describe("the walk-through page", () => {
  beforeEach(() => vi.setSystemTime(NOW_MS + 30_000));
  afterEach(() => onlineManager.setOnline(true));

  it(
    "the round card shows the night's lowest and highest, minutes out of window and the dew point in °F",
    async () => {
      const { api } = roundServer(makeUser({ ...USERS.grower, temperatureUnit: "F" }));
      renderApp(`/rounds/${ROUND_ID}`, api);
      const card = (await screen.findByRole("heading", { name: "Bench 1" }, FIRST_PAINT)).closest("article")!;
      const air = within(card).getByRole("group", { name: "Air temperature" });
      // 19 °C = 66.2 °F and 25 °C = 77.0 °F (NIST SP 811: t/°F = 1.8 t/°C + 32).
      expect(air.textContent).toContain("66.2 °F");
      expect(air.textContent).toContain("77.0 °F");
      expect(air.textContent).toContain("8 min out of window");
      expect(air.textContent).toContain("Too cold: 8 min");
      expect(air.textContent).toContain("Window 70.0–80.1 °F");
      expect(air.textContent).not.toContain("°C");
      const moisture = within(card).getByRole("group", { name: "Dew point and VPD" });
      expect(moisture.textContent).toContain("59.7 °F – 70.3 °F");
      expect(moisture.textContent).toContain("0.44 kPa – 0.63 kPa");
      // A margin is a difference: 2 °C is 3.6 °F, without the 32 offset.
      expect(moisture.textContent).toContain("3.6 °F above");
      expect(within(card).getByText("Air too cold")).toBeTruthy();
      expect(within(card).getByRole("group", { name: "Medium moisture" }).textContent).toContain("No readings in this time");
      expect(screen.getByText("0 of 2 benches checked")).toBeTruthy();
    },
    ROUTE_TEST_TIMEOUT_MS,
  );

  it(
    "an observation entered offline is queued, survives a reload, and is sent once online with the same clientId",
    async () => {
      const server = roundServer();
      const first = renderApp(`/rounds/${ROUND_ID}`, server.api);
      await observationButton();

      onlineManager.setOnline(false);
      await enterObservation();
      await waitFor(() => expect(waitingIndicator()?.textContent).toBe("Offline·1 waiting to send"));
      const card = screen.getByRole("heading", { name: "Bench 1" }).closest("article")!;
      expect(within(card).getByText("Waiting to send")).toBeTruthy();
      expect(within(card).getByText("Callused · mould · “White fuzz on two bases”")).toBeTruthy();
      expect(server.attempts).toHaveLength(0);

      // Kept in the browser's storage, with the clientId made on the tablet.
      await waitFor(() => expect(storedQueue().mutations).toHaveLength(1));
      const clientId = storedQueue().mutations[0]!.state.variables.input.clientId as string;
      expect(clientId).toMatch(/^[0-9a-f]{8}-[0-9a-f]{4}-4[0-9a-f]{3}-[89ab][0-9a-f]{3}-[0-9a-f]{12}$/);

      // Reload: a new app and QueryClient. The connection is back, but the first try still fails.
      first.unmount();
      server.state.isDown = true;
      onlineManager.setOnline(true);
      renderApp(`/rounds/${ROUND_ID}`, server.api);
      await waitFor(() => expect(waitingIndicator()?.textContent).toBe("1 waiting to send"), FIRST_PAINT);
      const reloaded = (await screen.findByRole("heading", { name: "Bench 1" }, FIRST_PAINT)).closest("article")!;
      expect(within(reloaded).getByText("Waiting to send")).toBeTruthy();
      expect(server.attempts.length).toBeGreaterThanOrEqual(1);

      // The network answers again: the next try goes through, with the same clientId.
      server.state.isDown = false;
      await waitFor(() => expect(server.stored.size).toBe(1), { timeout: 8000 });
      await waitFor(() => expect(waitingIndicator()).toBeNull());
      expect(server.fake.sent("POST /api/batches/11/observations")).toHaveLength(1);
      expect(new Set(server.attempts.map((a) => a.clientId))).toEqual(new Set([clientId]));
      expect(server.stored.get(clientId)).toMatchObject({ stage: "callused", flags: ["mould"], note: "White fuzz on two bases", roundId: ROUND_ID, observedOn: "2025-01-15" });
      expect(await within(reloaded).findByText("Saved")).toBeTruthy();
      expect(storedQueue().mutations).toHaveLength(0);
    },
    ROUTE_TEST_TIMEOUT_MS,
  );

  it(
    "flag toggles and counts are checked with the shared schema before anything is sent",
    async () => {
      const server = roundServer();
      renderApp(`/rounds/${ROUND_ID}`, server.api);
      fireEvent.click(await observationButton());
      const form = screen.getByRole("form", { name: "Observation of Harbour Amber" });
      const mould = within(form).getByRole("button", { name: "Mould" });
      expect(mould.getAttribute("aria-pressed")).toBe("false");
      fireEvent.click(mould);
      expect(mould.getAttribute("aria-pressed")).toBe("true");
      fireEvent.click(mould);
      expect(mould.getAttribute("aria-pressed")).toBe("false");

      const rooted = within(form).getByLabelText("Rooted so far");
      const lost = within(form).getByLabelText("Lost so far");
      const save = within(form).getByRole("button", { name: "Save observation" });
      fireEvent.change(rooted, { target: { value: "2.5" } });
      fireEvent.click(save);
      expect(await within(form).findByText("Use a whole number")).toBeTruthy();
      fireEvent.change(rooted, { target: { value: "-1" } });
      fireEvent.click(save);
      expect(await within(form).findByText("Counts cannot be negative")).toBeTruthy();
      // Running totals must add up: rooted + lost ≤ stuck (shared/domain/batch.ts).
      fireEvent.change(rooted, { target: { value: "50" } });
      fireEvent.change(lost, { target: { value: "20" } });
      fireEvent.click(save);
      expect((await within(form).findAllByText("50 rooted + 20 lost is more than the 60 stuck")).length).toBe(2);
      expect(rooted.getAttribute("aria-invalid")).toBe("true");
      expect(server.attempts).toHaveLength(0);

      // − and + step the count; toggled flags are sent once each, in the schema's order.
      fireEvent.change(lost, { target: { value: "" } });
      fireEvent.click(within(form).getByRole("button", { name: "One fewer rooted so far" }));
      expect((rooted as HTMLInputElement).value).toBe("49");
      fireEvent.click(within(form).getByRole("button", { name: "Rot" }));
      fireEvent.click(within(form).getByRole("button", { name: "Mould" }));
      fireEvent.click(within(form).getByRole("radio", { name: "Root initials" }));
      fireEvent.click(save);
      await waitFor(() => expect(server.stored.size).toBe(1));
      expect([...server.stored.values()][0]).toMatchObject({ stage: "root-initials", rootedCount: 49, lostCount: null, flags: ["mould", "rot"] });
    },
    ROUTE_TEST_TIMEOUT_MS,
  );

  it(
    "a bench checked off offline shows as waiting, counts in the indicator and is sent once when the connection returns",
    async () => {
      const server = roundServer();
      renderApp(`/rounds/${ROUND_ID}`, server.api);
      await observationButton();
      onlineManager.setOnline(false);
      fireEvent.click(screen.getByRole("button", { name: "Bench 1 checked" }));
      const card = screen.getByRole("heading", { name: "Bench 1" }).closest("article")!;
      expect(await within(card).findByText("Checked · waiting to send")).toBeTruthy();
      expect(screen.getByText("1 of 2 benches checked")).toBeTruthy();
      await waitFor(() => expect(waitingIndicator()?.textContent).toBe("Offline·1 waiting to send"));
      const finish = screen.getByRole("button", { name: "Finish the walk-through" }) as HTMLButtonElement;
      expect(finish.disabled).toBe(true);
      expect(screen.getByText("Finishing needs a connection.")).toBeTruthy();

      onlineManager.setOnline(true);
      await waitFor(() => expect(server.checks).toHaveLength(1));
      expect(await within(card).findByText(/Checked \d\d:\d\d by Gil Grower/)).toBeTruthy();
      await waitFor(() => expect(waitingIndicator()).toBeNull());
      expect(server.checks).toHaveLength(1);
    },
    ROUTE_TEST_TIMEOUT_MS,
  );

  it(
    "a finished round's address shows its summary: who, when, benches checked, problems",
    async () => {
      const summary: RoundSummary = {
        roundId: ROUND_ID,
        siteName: "Hillside nursery",
        scopeLabel: "Fig house",
        timeZone: "America/Chicago",
        startedAtMs: NOW_MS - 40 * 60_000,
        startedBy: { userId: 3, name: "Gil Grower" },
        finishedAtMs: NOW_MS - 5 * 60_000,
        finishedBy: { userId: 3, name: "Gil Grower" },
        walkedBy: ["Gil Grower"],
        benchCount: 2,
        checkedCount: 2,
        benches: [],
        notChecked: [],
        problems: {
          count: 1,
          alerts: [],
          observations: [{ observationId: 1, batchId: 11, variety: "Harbour Amber", benchId: 1, benchName: "Bench 1", zoneName: "Fig house", stage: "callused", flags: ["mould"], note: "White fuzz", photoCount: 0 }],
        },
        observationCount: 1,
        photoCount: 0,
        mailedTo: ["manager@nursery.test"],
      };
      const finished = makeRound({ status: "finished", finishedAtMs: summary.finishedAtMs, finishedBy: summary.finishedBy, checkedCount: 2 });
      const api = createApiFake({
        "GET /api/session": { body: makeSession(USERS.manager) },
        [`GET /api/rounds/${ROUND_ID}`]: { body: { round: finished } },
        [`GET /api/rounds/${ROUND_ID}/summary`]: { body: { round: finished, summary } },
      });
      renderApp(`/rounds/${ROUND_ID}`, api);
      expect(await screen.findByRole("heading", { name: "Walk-through summary: Fig house" }, FIRST_PAINT)).toBeTruthy();
      expect(screen.getByText("Benches checked").nextSibling?.textContent).toBe("2 of 2");
      expect(screen.getByText("Problems found").nextSibling?.textContent).toBe("1");
      expect(screen.getByText("Mailed to manager@nursery.test")).toBeTruthy();
      expect(screen.getByText(/mould — “White fuzz”/)).toBeTruthy();
      expect(api.sent(`GET /api/rounds/${ROUND_ID}/cards`)).toHaveLength(0);
    },
    ROUTE_TEST_TIMEOUT_MS,
  );
});
