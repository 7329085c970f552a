import { dehydrate, hydrate, partialMatchKey, type DehydratedState, type Mutation, type MutationKey, type QueryClient } from "@tanstack/react-query";

/*
 * Work entered on the tablet (observations, check-offs) is sent through TanStack Query mutations.
 * While the network is down they wait as *paused* mutations; this module keeps every waiting one
 * in the browser's storage, so a reload or a closed tab loses nothing, and puts them back into
 * the mutation cache on the next start (hydrate), from where they are sent again. The mutation
 * functions are not stored: they come from `queryClient.setMutationDefaults` for each key, which
 * must be registered before `restore()`.
 *
 * Built on the public dehydrate/hydrate and MutationCache APIs of @tanstack/react-query rather
 * than a persister package: only waiting mutations are kept (never query data), their photos in
 * IndexedDB beside them.
 */

/** Storage key of the waiting work (bump the version if the shape of what is stored changes). */
export const WAITING_STORAGE_KEY = "benchwarden.waitingToSend.v1";

/** What every queued mutation carries besides its own fields: a line a person recognises, and what was entered. */
export type QueuedVariables = { label: string; detail?: string };

/** An entry the server refused for good (400, 404, 409 …): kept so the grower can read it and enter it again. */
export type NotSentEntry = {
  id: string;
  label: string;
  detail: string | null;
  reason: string;
  atMs: number;
  mutationKey: readonly unknown[];
  variables: unknown;
};

type KeyValueStorage = Pick<Storage, "getItem" | "setItem">;

type Stored = {
  version: 1;
  savedAtMs: number;
  mutations: DehydratedState["mutations"];
  notSent: NotSentEntry[];
};

export function isQueuedKey(keys: readonly MutationKey[], mutationKey: MutationKey | undefined): boolean {
  return mutationKey !== undefined && keys.some((key) => partialMatchKey(mutationKey, key));
}

/** Waiting = not yet answered by the server: paused (offline, or queued behind another) or being tried. */
export function isWaiting(mutation: Pick<Mutation, "state" | "options">, keys: readonly MutationKey[]): boolean {
  return mutation.state.status === "pending" && isQueuedKey(keys, mutation.options.mutationKey);
}

function labelOf(variables: unknown): { label: string; detail: string | null } {
  const v = variables as Partial<QueuedVariables> | undefined;
  return { label: typeof v?.label === "string" ? v.label : "Entry", detail: typeof v?.detail === "string" ? v.detail : null };
}

function messageOf(error: unknown): string {
  return error instanceof Error && error.message ? error.message : "The server refused it";
}

function isStoredShape(value: unknown): value is Stored {
  if (typeof value !== "object" || value === null) return false;
  const v = value as Partial<Stored>;
  return v.version === 1 && Array.isArray(v.mutations) && Array.isArray(v.notSent);
}

type PersisterOptions = {
  queryClient: QueryClient;
  /** Mutation keys whose waiting mutations are kept (prefixes, as in TanStack filters). */
  keys: readonly MutationKey[];
  storage?: KeyValueStorage;
  storageKey?: string;
};

/** What the screen shows besides the waiting count: refused entries, and whether storage failed. */
export type PersisterStatus = { notSent: readonly NotSentEntry[]; isStorageFailing: boolean };

export type MutationPersister = ReturnType<typeof createMutationPersister>;

/** Keeps the waiting mutations of `keys` in storage and restores them; see the module comment. */
/**
 * This browser's localStorage, or a stand-in that refuses every write when storage is disabled
 * (reading `window.localStorage` itself throws in some locked-down or private modes).
 */
function browserStorage(): KeyValueStorage {
  try {
    return window.localStorage;
  } catch {
    return {
      getItem: () => null,
      setItem: () => {
        throw new Error("storage is disabled in this browser");
      },
    };
  }
}

export function createMutationPersister({ queryClient, keys, storage = browserStorage(), storageKey = WAITING_STORAGE_KEY }: PersisterOptions) {
  let notSent: NotSentEntry[] = [];
  let status: PersisterStatus = { notSent, isStorageFailing: false };
  const listeners = new Set<() => void>();

  function setStatus(next: Partial<PersisterStatus>) {
    const merged = { ...status, ...next };
    if (merged.notSent === status.notSent && merged.isStorageFailing === status.isStorageFailing) return;
    status = merged;
    for (const listener of listeners) listener();
  }

  function read(): Stored | null {
    try {
      const text = storage.getItem(storageKey);
      if (!text) return null;
      const parsed: unknown = JSON.parse(text);
      return isStoredShape(parsed) ? parsed : null;
    } catch {
      return null;
    }
  }

  /** The waiting mutations as they would be sent again: paused, without live error objects. */
  function snapshot(): DehydratedState["mutations"] {
    const { mutations } = dehydrate(queryClient, {
      shouldDehydrateMutation: (m) => isWaiting(m, keys),
      shouldDehydrateQuery: () => false,
    });
    return mutations.map((m) => ({
      ...m,
      state: { ...m.state, isPaused: true, failureCount: 0, failureReason: null, error: null, context: undefined },
    }));
  }

  function save() {
    const stored: Stored = { version: 1, savedAtMs: Date.now(), mutations: snapshot(), notSent };
    try {
      storage.setItem(storageKey, JSON.stringify(stored));
      setStatus({ isStorageFailing: false });
    } catch {
      // Full or disabled: what waits is still in memory and is sent while this page stays open.
      setStatus({ isStorageFailing: true });
    }
  }

  return {
    /**
     * Puts the stored waiting mutations back into the cache (paused) and returns how many. Call it
     * once per QueryClient, after setMutationDefaults; then `queryClient.resumePausedMutations()`.
     */
    restore(): number {
      const stored = read();
      if (!stored) return 0;
      notSent = stored.notSent;
      const mutations = stored.mutations.filter((m) => m.state.status === "pending" && isQueuedKey(keys, m.mutationKey));
      hydrate(queryClient, { mutations, queries: [] });
      setStatus({ notSent });
      return mutations.length;
    },

    /** Writes the waiting mutations now (also done on every change while subscribed). */
    save,

    /** Follows the mutation cache and keeps storage in step until the returned function is called. */
    subscribe(): () => void {
      const stop = queryClient.getMutationCache().subscribe((event) => {
        const mutation = event.mutation;
        if (!mutation || !isQueuedKey(keys, mutation.options.mutationKey)) return;
        if (event.type === "observerAdded" || event.type === "observerRemoved" || event.type === "observerOptionsUpdated") return;
        if (event.type === "updated" && event.action.type === "error") {
          notSent = [
            ...notSent,
            {
              id: `${Date.now()}-${mutation.mutationId}`,
              ...labelOf(mutation.state.variables),
              reason: messageOf(event.action.error),
              atMs: Date.now(),
              mutationKey: mutation.options.mutationKey ?? [],
              variables: mutation.state.variables,
            },
          ];
          setStatus({ notSent });
        }
        save();
      });
      // The last chance before the tab goes away (a reload, the tablet locking).
      const onPageHide = () => save();
      window.addEventListener("pagehide", onPageHide);
      return () => {
        stop();
        window.removeEventListener("pagehide", onPageHide);
      };
    },

    /** For useSyncExternalStore: the same object until something changes. */
    status: (): PersisterStatus => status,

    /** Forgets a not-sent entry (the grower has read it); returns it so its leftovers (photos) can go too. */
    dismiss(id: string): NotSentEntry | undefined {
      const entry = notSent.find((e) => e.id === id);
      notSent = notSent.filter((e) => e.id !== id);
      setStatus({ notSent });
      save();
      return entry;
    },

    /** For useSyncExternalStore: told when `status()` changes. */
    onStatusChange(listener: () => void): () => void {
      listeners.add(listener);
      return () => listeners.delete(listener);
    },
  };
}
