import { useEffect, useRef, useState, type FormEvent } from "react";
import { checkBatchCounts, type BatchStage } from "../../../../shared/domain/batch.js";
import { localDate } from "../../../../shared/domain/batch-calendar.js";
import {
  createObservationInputSchema,
  FLAG_LABELS,
  OBSERVATION_FLAGS,
  PHOTO_LIMITS,
  STAGE_LABELS,
  type BatchTallyView,
  type CreateObservationInput,
  type ObservationFlag,
} from "../../../../shared/schemas/batches.js";
import { Button } from "../../../components/ui/button";
import { TextAreaField } from "../../../components/ui/form";
import { Notice } from "../../../components/ui/notice";
import { errorsFromZod, focusFirstInvalid, type FormErrors } from "../../../lib/form";
import { useRecordObservation, type PhotoRef } from "../api/record-observation";
import { describeFlags } from "../utils/batch-words";
import { makeClientId } from "../utils/client-id";
import { CountField } from "./count-field";
import { StagePicker } from "./stage-picker";
import { ToggleButton } from "./toggle-button";

const FIELDS = ["stage", "rootedCount", "lostCount", "flags", "note", "photos"] as const;
const NO_ERRORS: FormErrors = { fields: {}, form: null };
const MB = 1024 * 1024;

/** Where photos wait until the observation is sent (features/offline's photo store, passed in by the page). */
export type PhotoKeeper = { keep(file: File): Promise<PhotoRef>; readonly isDurable: boolean };

export type QuickObservationBatch = { id: number; variety: string; countStuck: number; stage: BatchStage; tally: BatchTallyView };

type QuickObservationProps = {
  batch: QuickObservationBatch;
  /** "Bench 1", for the waiting list's label. */
  benchName: string;
  roundId: number | null;
  /** The site's time zone: the observation is dated the day it was entered there, even if sent later. */
  timeZone: string;
  photoKeeper: PhotoKeeper;
  isOnline: boolean;
  onDone: () => void;
};

/** "" → not counted (null); otherwise the number as typed, for the shared schema to judge ("2.5", "-1", "abc"). */
export function parseCount(text: string): number | null {
  const trimmed = text.trim();
  return trimmed === "" ? null : Number(trimmed);
}

/**
 * Builds the observation as the server will read it and checks it with the server's own schema,
 * then the running totals against the count stuck (shared batch arithmetic). Returns the body
 * or the messages to show.
 */
export function validateObservation(
  values: { clientId: string; observedOn: string; stage: BatchStage; rooted: string; lost: string; flags: readonly ObservationFlag[]; note: string; roundId: number | null },
  batch: Pick<QuickObservationBatch, "countStuck" | "tally">,
): { ok: true; input: CreateObservationInput } | { ok: false; errors: FormErrors } {
  const parsed = createObservationInputSchema.safeParse({
    clientId: values.clientId,
    observedOn: values.observedOn,
    stage: values.stage,
    rootedCount: parseCount(values.rooted),
    lostCount: parseCount(values.lost),
    flags: [...values.flags],
    note: values.note,
    roundId: values.roundId,
  });
  if (!parsed.success) return { ok: false, errors: errorsFromZod(parsed.error, FIELDS) };
  const input = parsed.data;
  // A count left empty stands at the latest one recorded (running totals), as on the server.
  const rooted = input.rootedCount ?? batch.tally.rooted;
  const lost = input.lostCount ?? batch.tally.lost;
  const check = checkBatchCounts({ stuck: batch.countStuck, rooted, lost });
  if (!check.ok) {
    const message = `${rooted} rooted + ${lost} lost is more than the ${batch.countStuck} stuck`;
    return { ok: false, errors: { fields: { rootedCount: message, lostCount: message }, form: null } };
  }
  return { ok: true, input };
}

/** What was entered, in words, for the waiting list (and a refused entry). */
export function describeEntry(input: CreateObservationInput, photoCount: number): string {
  const parts = [STAGE_LABELS[input.stage], describeFlags(input.flags)];
  if (input.rootedCount !== null) parts.push(`${input.rootedCount} rooted so far`);
  if (input.lostCount !== null) parts.push(`${input.lostCount} lost so far`);
  if (input.note) parts.push(`“${input.note}”`);
  if (photoCount > 0) parts.push(photoCount === 1 ? "1 photo" : `${photoCount} photos`);
  return parts.join(" · ");
}

type ChosenPhoto = { file: File; url: string };

/**
 * The walk-through's quick entry for one batch: stage, running counts, flags as big toggles, a
 * note and photos straight from the camera. Saving never waits for the network: the observation
 * (and its photos) is kept on the tablet and sent now or when the connection returns.
 */
export function QuickObservation({ batch, benchName, roundId, timeZone, photoKeeper, isOnline, onDone }: QuickObservationProps) {
  const formRef = useRef<HTMLFormElement>(null);
  const [stage, setStage] = useState<BatchStage>(batch.stage);
  const [rooted, setRooted] = useState("");
  const [lost, setLost] = useState("");
  const [flags, setFlags] = useState<ObservationFlag[]>([]);
  const [note, setNote] = useState("");
  const [photos, setPhotos] = useState<ChosenPhoto[]>([]);
  const [errors, setErrors] = useState<FormErrors>(NO_ERRORS);
  const [isKeeping, setIsKeeping] = useState(false);
  const record = useRecordObservation();
  const idPrefix = `obs-${batch.id}`;

  // Object URLs for the previews are let go with the form.
  const urls = useRef<string[]>([]);
  useEffect(() => () => urls.current.forEach((u) => URL.revokeObjectURL(u)), []);

  function toggleFlag(flag: ObservationFlag) {
    setFlags((current) => (current.includes(flag) ? current.filter((f) => f !== flag) : OBSERVATION_FLAGS.filter((f) => f === flag || current.includes(f))));
  }

  function addPhotos(list: FileList | null) {
    if (!list) return;
    const problems: string[] = [];
    const next = [...photos];
    for (const file of Array.from(list)) {
      if (file.type && !file.type.startsWith("image/")) {
        problems.push(`${file.name} is not an image`);
      } else if (file.size > PHOTO_LIMITS.maxBytes) {
        problems.push(`${file.name} is larger than ${PHOTO_LIMITS.maxBytes / MB} MB`);
      } else if (next.length >= PHOTO_LIMITS.maxPerUpload) {
        problems.push(`At most ${PHOTO_LIMITS.maxPerUpload} photos per observation`);
        break;
      } else {
        const url = URL.createObjectURL(file);
        urls.current.push(url);
        next.push({ file, url });
      }
    }
    setPhotos(next);
    setErrors((e) => ({ ...e, fields: { ...e.fields, photos: problems.join(". ") } }));
  }

  function removePhoto(index: number) {
    setPhotos((current) => current.filter((_, i) => i !== index));
  }

  async function onSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const result = validateObservation(
      { clientId: makeClientId(), observedOn: localDate(Date.now(), timeZone), stage, rooted, lost, flags, note, roundId },
      batch,
    );
    if (!result.ok) {
      setErrors(result.errors);
      focusFirstInvalid(formRef.current);
      return;
    }
    setErrors(NO_ERRORS);
    setIsKeeping(true);
    let refs: PhotoRef[];
    try {
      refs = await Promise.all(photos.map((p) => photoKeeper.keep(p.file)));
    } catch {
      setIsKeeping(false);
      setErrors({ fields: { photos: "The photos could not be kept on this tablet. Remove them or try again." }, form: null });
      return;
    }
    setIsKeeping(false);
    record.mutate({
      label: `Observation · ${batch.variety}, ${benchName}`,
      detail: describeEntry(result.input, refs.length),
      batchId: batch.id,
      input: result.input,
      photos: refs,
    });
    onDone();
  }

  return (
    <form ref={formRef} onSubmit={(e) => void onSubmit(e)} noValidate aria-label={`Observation of ${batch.variety}`} className="flex flex-col gap-4 rounded-xl border-2 border-accent bg-page p-3 sm:p-4">
      {errors.form && <Notice tone="error">{errors.form}</Notice>}
      <StagePicker name={`${idPrefix}-stage`} value={stage} onChange={setStage} error={errors.fields.stage} />

      <div className="grid gap-3 sm:grid-cols-2">
        <CountField
          label="Rooted so far"
          value={rooted}
          onChange={setRooted}
          hint={`Last count ${batch.tally.rooted} of ${batch.countStuck}; leave empty if not counted`}
          error={errors.fields.rootedCount}
        />
        <CountField
          label="Lost so far"
          value={lost}
          onChange={setLost}
          hint={`Last count ${batch.tally.lost}; leave empty if not counted`}
          error={errors.fields.lostCount}
        />
      </div>

      <fieldset className="flex flex-col gap-2">
        <legend className="mb-1 text-lg font-semibold">Flags</legend>
        <div className="grid grid-cols-2 gap-2 sm:grid-cols-3">
          {OBSERVATION_FLAGS.map((flag) => (
            <ToggleButton key={flag} isOn={flags.includes(flag)} onToggle={() => toggleFlag(flag)}>
              {FLAG_LABELS[flag]}
            </ToggleButton>
          ))}
        </div>
        {errors.fields.flags && <p className="text-base font-semibold text-high">{errors.fields.flags}</p>}
      </fieldset>

      <TextAreaField label="Note" rows={2} value={note} onChange={(e) => setNote(e.target.value)} error={errors.fields.note} placeholder="What you saw (optional)" />

      <div className="flex flex-col gap-2">
        <span className="text-lg font-semibold" id={`${idPrefix}-photos-label`}>
          Photos
        </span>
        <div className="flex flex-wrap items-center gap-2">
          {photos.map((photo, i) => (
            <div key={photo.url} className="flex flex-col items-center gap-1">
              <img src={photo.url} alt={`New photo ${i + 1}`} className="size-24 rounded-lg border-2 border-line object-cover" />
              <button type="button" onClick={() => removePhoto(i)} className="min-h-touch rounded-lg px-2 text-base font-semibold underline" aria-label={`Remove new photo ${i + 1}`}>
                Remove
              </button>
            </div>
          ))}
          {photos.length < PHOTO_LIMITS.maxPerUpload && (
            <label className="inline-flex min-h-14 cursor-pointer items-center gap-2 rounded-xl border-2 border-dashed border-ink bg-surface px-4 text-lg font-semibold focus-within:outline focus-within:outline-3 focus-within:outline-accent">
              <CameraIcon />
              {photos.length === 0 ? "Take photos" : "Add more"}
              <input
                type="file"
                accept="image/*"
                capture="environment"
                multiple
                className="sr-only"
                aria-describedby={`${idPrefix}-photos-label`}
                onChange={(e) => {
                  addPhotos(e.target.files);
                  e.target.value = "";
                }}
              />
            </label>
          )}
        </div>
        {errors.fields.photos && <p className="text-base font-semibold text-high">{errors.fields.photos}</p>}
      </div>

      {!isOnline && (
        <Notice tone="warning" title="No connection">
          This observation{photos.length > 0 ? " and its photos" : ""} will be kept on this tablet and sent when the connection returns.
          {photos.length > 0 && !photoKeeper.isDurable && " This browser keeps photos in this page only: do not reload it until they are sent."}
        </Notice>
      )}

      <div className="flex flex-wrap gap-3">
        <Button type="submit" variant="primary" className="min-h-14 flex-1" isBusy={isKeeping}>
          Save observation
        </Button>
        <Button onClick={onDone} className="min-h-14">
          Cancel
        </Button>
      </div>
    </form>
  );
}

function CameraIcon() {
  return (
    <svg viewBox="0 0 24 24" className="size-6 shrink-0" fill="none" stroke="currentColor" strokeWidth={2.25} strokeLinejoin="round" aria-hidden="true" focusable="false">
      <path d="M4 8h3l2-3h6l2 3h3v11H4z" />
      <circle cx="12" cy="13" r="3.5" />
    </svg>
  );
}
