import type { MutationKey, QueryClient } from "@tanstack/react-query";
import { useEffect, useState, type ReactNode } from "react";
import { useToast } from "../components/ui/toast";
import { invalidateAfterBatchChange } from "../features/batches/api/invalidate-after-batch-change";
import {
  makeRecordObservation,
  RECORD_OBSERVATION_MUTATION_KEY,
  type RecordObservationResult,
  type RecordObservationVariables,
} from "../features/batches/api/record-observation";
import { OfflineQueueProvider, type OfflineQueueValue } from "../features/offline/hooks/offline-queue";
import { createMutationPersister, isQueuedKey, type QueuedVariables } from "../features/offline/utils/persist-mutations";
import { createPhotoStore } from "../features/offline/utils/photo-store";
import { retryDelayMs, shouldKeepTrying } from "../features/offline/utils/retry";
import { checkBench, CHECK_BENCH_MUTATION_KEY, type CheckBenchVariables } from "../features/rounds/api/check-bench";
import { applyBenchCheck, applyRoundObservation } from "../features/rounds/api/get-round-cards";
import type { CheckBenchResponse } from "../../shared/schemas/rounds.js";

/*
 * Work entered on the tablet that must survive patchy Wi-Fi (issue 6 §5): observations (with
 * their photos) and bench check-offs. Each is a mutation whose function is registered here with
 * setMutationDefaults, so one restored from storage after a reload is sent by the same code as
 * one entered now. They share one scope: sent one at a time, in the order entered.
 */
export const OFFLINE_MUTATION_KEYS: readonly MutationKey[] = [RECORD_OBSERVATION_MUTATION_KEY, CHECK_BENCH_MUTATION_KEY];

const WAITING_SCOPE = { id: "benchwarden-waiting-to-send" };

const started = new WeakMap<QueryClient, OfflineQueueValue>();

function registerDefaults(queryClient: QueryClient, photoStore: OfflineQueueValue["photoStore"]) {
  const shared = { scope: WAITING_SCOPE, retry: shouldKeepTrying, retryDelay: retryDelayMs, networkMode: "online" as const };
  queryClient.setMutationDefaults<RecordObservationResult, Error, RecordObservationVariables>(RECORD_OBSERVATION_MUTATION_KEY, {
    ...shared,
    mutationFn: makeRecordObservation(photoStore),
    onSuccess: ({ observation }) => {
      applyRoundObservation(queryClient, observation);
      void invalidateAfterBatchChange(queryClient, observation.batchId);
    },
  });
  queryClient.setMutationDefaults<CheckBenchResponse, Error, CheckBenchVariables>(CHECK_BENCH_MUTATION_KEY, {
    ...shared,
    mutationFn: checkBench,
    onSuccess: (answer, { roundId }) => applyBenchCheck(queryClient, roundId, answer),
  });
}

/**
 * Once per QueryClient: register the mutation functions, then put back what was waiting when
 * the page was last closed (it is sent when `startSending` runs and the browser is online).
 */
export function prepareOfflineWork(queryClient: QueryClient): OfflineQueueValue {
  const existing = started.get(queryClient);
  if (existing) return existing;
  const photoStore = createPhotoStore();
  registerDefaults(queryClient, photoStore);
  const persister = createMutationPersister({ queryClient, keys: OFFLINE_MUTATION_KEYS });
  const value: OfflineQueueValue = {
    keys: OFFLINE_MUTATION_KEYS,
    persister,
    photoStore,
    discard: (entry) => {
      persister.dismiss(entry.id);
      const photos = (entry.variables as Partial<RecordObservationVariables> | undefined)?.photos ?? [];
      if (photos.length > 0) void photoStore.remove(photos.map((p) => p.key));
    },
    sendNow: () => void queryClient.resumePausedMutations(),
  };
  persister.restore();
  started.set(queryClient, value);
  return value;
}

/** Keeps storage in step with the waiting work and sends what was restored. */
function startSending(queryClient: QueryClient, value: OfflineQueueValue): () => void {
  const stop = value.persister.subscribe();
  // Restored mutations are paused; the client resumes paused ones only on an online *change*.
  void queryClient.resumePausedMutations();
  return stop;
}

/** Provides the waiting-to-send queue to the app (AppProvider wraps everything in it). */
export function OfflineWork({ queryClient, children }: { queryClient: QueryClient; children: ReactNode }) {
  const [value] = useState(() => prepareOfflineWork(queryClient));
  const { showToast } = useToast();
  useEffect(() => startSending(queryClient, value), [queryClient, value]);

  // Whatever page is open: say when the server refused something that waited, or photos were lost.
  useEffect(
    () =>
      queryClient.getMutationCache().subscribe((event) => {
        if (event.type !== "updated" || !isQueuedKey(OFFLINE_MUTATION_KEYS, event.mutation.options.mutationKey)) return;
        const label = (event.mutation.state.variables as Partial<QueuedVariables> | undefined)?.label ?? "An entry";
        if (event.action.type === "error") {
          const reason = event.action.error instanceof Error ? event.action.error.message : "refused";
          showToast(`Not sent: ${label}. ${reason}`, "error");
        }
        if (event.action.type === "success") {
          const missing = (event.action.data as Partial<RecordObservationResult> | undefined)?.missingPhotos ?? 0;
          if (missing > 0) showToast(`${label}: saved, but ${missing === 1 ? "1 photo was" : `${missing} photos were`} lost on this tablet before sending.`, "error");
        }
      }),
    [queryClient, showToast],
  );
  return <OfflineQueueProvider value={value}>{children}</OfflineQueueProvider>;
}
