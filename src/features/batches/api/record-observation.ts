import { useMutation, useMutationState } from "@tanstack/react-query";
import { createObservationResponseSchema, PHOTO_LIMITS, type CreateObservationInput, type ObservationView } from "../../../../shared/schemas/batches.js";
import { apiSend } from "../../../lib/api-client";
import { uploadPhotos } from "./upload-photos";

/**
 * Recording an observation from the tablet, photos included, as one mutation that may wait
 * offline. Its mutationFn is registered with `setMutationDefaults` at start (app/offline-work.ts),
 * so an observation restored after a reload is sent by the same code; the hook below only names
 * the key.
 */
export const RECORD_OBSERVATION_MUTATION_KEY = ["observations", "record"] as const;

/** A photo kept on the tablet until it is sent (features/offline's photo store). */
export type PhotoRef = { key: string; name: string; type: string; bytes: number };

export type RecordObservationVariables = {
  /** "Observation · Harbour Amber, Bench 1": what the waiting list shows. */
  label: string;
  /** What was entered, in words, so a refused entry can be read and entered again. */
  detail: string;
  batchId: number;
  /** With the device's clientId: sending it again stores nothing new (the server answers 200). */
  input: CreateObservationInput;
  photos: PhotoRef[];
};

export type RecordObservationResult = {
  observation: ObservationView;
  /** False when the server already had this clientId (a re-send). */
  created: boolean;
  /** Photos the tablet no longer had (kept in memory only, then reloaded). */
  missingPhotos: number;
};

/** Where the mutation finds the photos' bytes, and lets go of them once they are stored. */
export type PhotoSource = {
  get(key: string): Promise<Blob | undefined>;
  remove(keys: readonly string[]): Promise<void>;
};

/** POST /api/batches/:id/observations (idempotent on clientId: 201 new, 200 already stored). */
export function createObservation({ batchId, input }: { batchId: number; input: CreateObservationInput }) {
  return apiSend("POST", `/api/batches/${encodeURIComponent(batchId)}/observations`, createObservationResponseSchema, { body: input });
}

/**
 * The observation first (idempotent on its clientId), then its photos in uploads of at most
 * PHOTO_LIMITS.maxPerUpload. A failure after the observation is stored retries the whole: the
 * observation answers 200 with the stored one, and photos already stored are stored once.
 */
export function makeRecordObservation(photos: PhotoSource) {
  return async function recordObservation(variables: RecordObservationVariables): Promise<RecordObservationResult> {
    const { observation, created } = await createObservation({ batchId: variables.batchId, input: variables.input });
    let latest = observation;
    let missingPhotos = 0;
    const refs = variables.photos;
    for (let i = 0; i < refs.length; i += PHOTO_LIMITS.maxPerUpload) {
      const chunk = refs.slice(i, i + PHOTO_LIMITS.maxPerUpload);
      const files = [];
      for (const ref of chunk) {
        const blob = await photos.get(ref.key);
        if (blob) files.push({ blob, name: ref.name });
        else missingPhotos += 1;
      }
      if (files.length > 0) latest = (await uploadPhotos({ observationId: observation.id, files })).observation;
    }
    if (refs.length > 0) await photos.remove(refs.map((r) => r.key)).catch(() => undefined);
    return { observation: latest, created, missingPhotos };
  };
}

/** Records through the registered defaults (sent now, or kept until the connection returns). */
export function useRecordObservation() {
  return useMutation<RecordObservationResult, Error, RecordObservationVariables>({ mutationKey: RECORD_OBSERVATION_MUTATION_KEY });
}

/** `isSending`: on its way now (not paused, no failed try yet); otherwise it waits. */
export type PendingObservation = { variables: RecordObservationVariables; isSending: boolean; submittedAtMs: number };

/** Observations of a batch entered here and not yet answered by the server (offline, or on their way). */
export function usePendingObservations(batchId: number): PendingObservation[] {
  return useMutationState({
    filters: {
      mutationKey: RECORD_OBSERVATION_MUTATION_KEY,
      status: "pending",
      predicate: (m) => (m.state.variables as RecordObservationVariables | undefined)?.batchId === batchId,
    },
    select: (m) => ({
      variables: m.state.variables as RecordObservationVariables,
      isSending: !m.state.isPaused && m.state.failureCount === 0,
      submittedAtMs: m.state.submittedAt,
    }),
  });
}
