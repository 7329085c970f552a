import { MutationObserver, onlineManager, QueryClient } from "@tanstack/react-query";
import { afterEach, describe, expect, it, vi } from "vitest";
import { ApiError } from "../../../lib/api-client";
import { createMutationPersister, WAITING_STORAGE_KEY } from "./persist-mutations";
import { retryDelayMs, shouldKeepTrying } from "./retry";

const KEY = ["observations", "record"] as const;
const OTHER = ["users", "invite"] as const;
const flush = () => new Promise((r) => setTimeout(r, 10));

type Vars = { label: string; clientId: string };

/** A client as the app makes it: the mutation function registered per key, before anything is restored. */
function client(mutationFn: (v: Vars) => Promise<unknown>) {
  const queryClient = new QueryClient();
  queryClient.setMutationDefaults(KEY, { mutationFn, retry: shouldKeepTrying, retryDelay: () => 10, scope: { id: "waiting" } });
  queryClient.mount();
  return queryClient;
}

function mutate(queryClient: QueryClient, variables: Vars, key: readonly string[] = KEY) {
  void new MutationObserver<unknown, Error, Vars>(queryClient, { mutationKey: key }).mutate(variables).catch(() => undefined);
}

function stored() {
  return JSON.parse(window.localStorage.getItem(WAITING_STORAGE_KEY) ?? "null") as { mutations: { mutationKey: string[]; state: { variables: Vars; isPaused: boolean } }[]; notSent: { label: string; reason: string }[] } | null;
}

describe("waiting mutations kept in storage", () => {
  afterEach(() => onlineManager.setOnline(true));

  it("a mutation made offline is stored paused, restored into a new client after a reload, and sent once online with the same variables", async () => {
    onlineManager.setOnline(false);
    const firstFn = vi.fn(async () => ({ ok: true }));
    const first = client(firstFn);
    const persister = createMutationPersister({ queryClient: first, keys: [KEY] });
    const stop = persister.subscribe();
    mutate(first, { label: "Observation · Harbour Amber, Bench 1", clientId: "c0ffee00-0000-4000-8000-000000000001" });
    mutate(first, { label: "Invite", clientId: "not kept" }, OTHER);
    await flush();
    expect(firstFn).not.toHaveBeenCalled();
    expect(stored()?.mutations).toEqual([
      expect.objectContaining({ mutationKey: [...KEY], state: expect.objectContaining({ isPaused: true, status: "pending", variables: { label: "Observation · Harbour Amber, Bench 1", clientId: "c0ffee00-0000-4000-8000-000000000001" } }) }),
    ]);
    stop();
    first.unmount();

    // The reload: a new client, still offline.
    const secondFn = vi.fn(async (v: Vars) => ({ stored: v.clientId }));
    const second = client(secondFn);
    const again = createMutationPersister({ queryClient: second, keys: [KEY] });
    expect(again.restore()).toBe(1);
    const stopAgain = again.subscribe();
    void second.resumePausedMutations();
    await flush();
    expect(second.getMutationCache().getAll().map((m) => [m.state.status, m.state.isPaused])).toEqual([["pending", true]]);
    expect(secondFn).not.toHaveBeenCalled();

    onlineManager.setOnline(true);
    await vi.waitFor(() => expect(secondFn).toHaveBeenCalledTimes(1));
    expect(secondFn.mock.calls[0]![0]).toEqual({ label: "Observation · Harbour Amber, Bench 1", clientId: "c0ffee00-0000-4000-8000-000000000001" });
    await vi.waitFor(() => expect(stored()?.mutations).toEqual([]));
    expect(firstFn).not.toHaveBeenCalled();
    stopAgain();
    second.unmount();
  });

  it("a dropped connection keeps the entry waiting and retrying; a refusal moves it to the not-sent list", async () => {
    let answer: "network" | "refuse" = "network";
    const fn = vi.fn(async () => {
      if (answer === "network") throw new ApiError({ status: 0, code: "network-error", title: "No connection" });
      throw new ApiError({ status: 409, code: "batch-closed", title: "Conflict", detail: "This batch was closed on 2025-01-10" });
    });
    const queryClient = client(fn);
    const persister = createMutationPersister({ queryClient, keys: [KEY] });
    const stop = persister.subscribe();
    mutate(queryClient, { label: "Observation · Fig Brown Turkey, Bench 3", clientId: "c0ffee00-0000-4000-8000-000000000002" });
    await vi.waitFor(() => expect(fn.mock.calls.length).toBeGreaterThanOrEqual(3));
    expect(queryClient.getMutationCache().getAll()[0]!.state.status).toBe("pending");
    expect(stored()?.mutations).toHaveLength(1);

    answer = "refuse";
    await vi.waitFor(() => expect(persister.status().notSent).toHaveLength(1));
    expect(persister.status().notSent[0]).toMatchObject({ label: "Observation · Fig Brown Turkey, Bench 3", reason: "This batch was closed on 2025-01-10" });
    expect(stored()).toMatchObject({ mutations: [], notSent: [{ label: "Observation · Fig Brown Turkey, Bench 3" }] });

    persister.dismiss(persister.status().notSent[0]!.id);
    expect(persister.status().notSent).toEqual([]);
    expect(stored()?.notSent).toEqual([]);
    stop();
    queryClient.unmount();
  });

  it("says when storage refuses to keep them", async () => {
    onlineManager.setOnline(false);
    const queryClient = client(async () => undefined);
    const storage = { getItem: () => null, setItem: () => { throw new DOMException("full", "QuotaExceededError"); } };
    const persister = createMutationPersister({ queryClient, keys: [KEY], storage });
    const stop = persister.subscribe();
    mutate(queryClient, { label: "Check-off · Bench 2", clientId: "x" });
    await vi.waitFor(() => expect(persister.status().isStorageFailing).toBe(true));
    stop();
    queryClient.unmount();
  });

  it("stored garbage is ignored rather than crashing the start", () => {
    window.localStorage.setItem(WAITING_STORAGE_KEY, "{not json");
    const queryClient = client(async () => undefined);
    expect(createMutationPersister({ queryClient, keys: [KEY] }).restore()).toBe(0);
    window.localStorage.setItem(WAITING_STORAGE_KEY, JSON.stringify({ version: 99, mutations: [] }));
    expect(createMutationPersister({ queryClient, keys: [KEY] }).restore()).toBe(0);
  });
});

describe("when to keep trying", () => {
  const err = (status: number) => new ApiError({ status, code: "x", title: "x" });

  it("keeps trying through no connection, a signed-out session and busy servers; gives up on refusals", () => {
    expect(shouldKeepTrying(50, err(0))).toBe(true);
    expect(shouldKeepTrying(50, err(401))).toBe(true);
    expect(shouldKeepTrying(3, err(503))).toBe(true);
    expect(shouldKeepTrying(8, err(503))).toBe(false);
    for (const status of [400, 403, 404, 409, 413, 415]) expect(shouldKeepTrying(0, err(status))).toBe(false);
    expect(shouldKeepTrying(0, new Error("not an API error"))).toBe(false);
  });

  it("waits 1 s, 2 s, 4 s … at most 30 s between tries", () => {
    expect([1, 2, 3, 4, 5, 6, 10].map(retryDelayMs)).toEqual([1000, 2000, 4000, 8000, 16000, 30000, 30000]);
  });
});
