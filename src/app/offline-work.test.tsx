import { onlineManager } from "@tanstack/react-query";
import { fireEvent, render, screen, waitFor, within } from "@testing-library/react";
import { afterEach, describe, expect, it, vi } from "vitest";
import { WaitingToSend } from "../features/offline/components/waiting-to-send";
import { WAITING_STORAGE_KEY } from "../features/offline/utils/persist-mutations";
import { createQueryClient } from "../lib/query-client";
import { AppProvider } from "./provider";

/** What a tablet left in storage: one observation entered offline, then the page was closed. */
function leaveWaiting() {
  const variables = {
    label: "Observation · Harbour Amber, Bench 1",
    detail: "Callused · mould",
    batchId: 11,
    input: { clientId: "c0ffee00-0000-4000-8000-000000000003", observedOn: "2025-01-15", stage: "callused", rootedCount: null, lostCount: null, flags: ["mould"], note: null, roundId: 7 },
    photos: [],
  };
  const state = { context: undefined, data: undefined, error: null, failureCount: 0, failureReason: null, isPaused: true, status: "pending", variables, submittedAt: Date.UTC(2025, 0, 15, 6) };
  window.localStorage.setItem(
    WAITING_STORAGE_KEY,
    JSON.stringify({ version: 1, savedAtMs: Date.now(), mutations: [{ mutationKey: ["observations", "record"], state, scope: { id: "benchwarden-waiting-to-send" } }], notSent: [] }),
  );
}

describe("the waiting-to-send indicator", () => {
  afterEach(() => onlineManager.setOnline(true));

  it("after a reload while still offline, says how many entries wait and lists them", async () => {
    leaveWaiting();
    // Nothing may reach a network here: a try would answer "no connection".
    vi.stubGlobal("fetch", () => Promise.reject(new TypeError("Failed to fetch")));
    onlineManager.setOnline(false);
    const view = render(
      <AppProvider queryClient={createQueryClient()}>
        <WaitingToSend />
      </AppProvider>,
    );
    const indicator = await screen.findByTestId("waiting-to-send");
    expect(indicator.textContent).toBe("Offline·1 waiting to send");
    fireEvent.click(indicator);
    const dialog = screen.getByRole("dialog", { name: "1 waiting to send" });
    expect(within(dialog).getByText("Observation · Harbour Amber, Bench 1")).toBeTruthy();
    expect(within(dialog).getByText("Callused · mould")).toBeTruthy();
    expect(within(dialog).getByText(/No connection: kept on this tablet/)).toBeTruthy();
    view.unmount();
  });

  it("shows nothing when all is sent and the connection is up", async () => {
    render(
      <AppProvider queryClient={createQueryClient()}>
        <WaitingToSend />
        <p>page</p>
      </AppProvider>,
    );
    await screen.findByText("page");
    await waitFor(() => expect(screen.queryByTestId("waiting-to-send")).toBeNull());
  });
});
