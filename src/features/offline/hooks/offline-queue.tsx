import { onlineManager, useMutationState, type MutationKey, type MutationState } from "@tanstack/react-query";
import { createContext, use, useCallback, useSyncExternalStore, type ReactNode } from "react";
import { isWaiting, type MutationPersister, type NotSentEntry, type PersisterStatus, type QueuedVariables } from "../utils/persist-mutations";
import type { PhotoStore } from "../utils/photo-store";

export type OfflineQueueValue = {
  /** The mutation keys whose work waits on the tablet while offline. */
  keys: readonly MutationKey[];
  persister: MutationPersister;
  photoStore: PhotoStore;
  /** Forget a not-sent entry and whatever it left behind (its photos). */
  discard: (entry: NotSentEntry) => void;
  /** Try everything that waits now instead of at the next retry. */
  sendNow: () => void;
};

const OfflineQueueContext = createContext<OfflineQueueValue | null>(null);

export function OfflineQueueProvider({ value, children }: { value: OfflineQueueValue; children: ReactNode }) {
  return <OfflineQueueContext value={value}>{children}</OfflineQueueContext>;
}

export function useOfflineQueue(): OfflineQueueValue {
  const value = use(OfflineQueueContext);
  if (!value) throw new Error("useOfflineQueue must be used inside <OfflineQueueProvider>");
  return value;
}

/** Whether the browser says it has a network (TanStack's onlineManager: the online/offline events). */
export function useIsOnline(): boolean {
  return useSyncExternalStore(
    useCallback((onChange: () => void) => onlineManager.subscribe(onChange), []),
    () => onlineManager.isOnline(),
    () => true,
  );
}

export type WaitingEntry = { label: string; detail: string | null; isPaused: boolean; failureCount: number; failureStatus: number | null; submittedAtMs: number };

function toEntry(state: MutationState<unknown, unknown, unknown, unknown>): WaitingEntry {
  const reason = state.failureReason as { status?: unknown } | null;
  const variables = state.variables as Partial<QueuedVariables> | undefined;
  return {
    label: variables?.label ?? "Entry",
    detail: variables?.detail ?? null,
    isPaused: state.isPaused,
    failureCount: state.failureCount,
    failureStatus: typeof reason?.status === "number" ? reason.status : null,
    submittedAtMs: state.submittedAt,
  };
}

/** Everything entered here that the server has not answered yet, oldest first. */
export function useWaitingEntries(): WaitingEntry[] {
  const { keys } = useOfflineQueue();
  return useMutationState({
    filters: { predicate: (mutation) => isWaiting(mutation, keys) },
    select: (mutation) => toEntry(mutation.state),
  });
}

/** The refused entries and whether storage is failing. */
export function usePersisterStatus(): PersisterStatus {
  const { persister } = useOfflineQueue();
  return useSyncExternalStore(persister.onStatusChange, persister.status, persister.status);
}
