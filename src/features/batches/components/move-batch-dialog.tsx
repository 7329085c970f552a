import { useRef, useState, type FormEvent } from "react";
import { moveBatchInputSchema, type BatchView } from "../../../../shared/schemas/batches.js";
import { Button } from "../../../components/ui/button";
import { Dialog } from "../../../components/ui/dialog";
import { SelectField, TextAreaField, TextField } from "../../../components/ui/form";
import { Notice } from "../../../components/ui/notice";
import { useToast } from "../../../components/ui/toast";
import { useFormErrors } from "../../../lib/form";
import { useMoveBatch } from "../api/move-batch";
import { BenchOptions, type BenchGroup } from "./bench-options";

const FIELDS = ["benchId", "effectiveAtMs", "note"] as const;

/** `<input type="datetime-local">` in the tablet's local time. */
function toLocalInput(timeMs: number): string {
  const d = new Date(timeMs);
  const pad = (n: number) => String(n).padStart(2, "0");
  return `${d.getFullYear()}-${pad(d.getMonth() + 1)}-${pad(d.getDate())}T${pad(d.getHours())}:${pad(d.getMinutes())}`;
}

/** Move a batch to another bench (now, or when it really moved); its history keeps every placement. */
export function MoveBatchDialog({ batch, benchGroups, onClose }: { batch: BatchView; benchGroups: readonly BenchGroup[]; onClose: () => void }) {
  const formRef = useRef<HTMLFormElement>(null);
  const [benchId, setBenchId] = useState("");
  const [when, setWhen] = useState("");
  const [note, setNote] = useState("");
  const { errors, validate, showServerError } = useFormErrors({ fields: FIELDS });
  const move = useMoveBatch();
  const { showToast } = useToast();

  function onSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const effectiveAtMs = when === "" ? undefined : new Date(when).getTime();
    const input = validate(moveBatchInputSchema, { benchId: benchId === "" ? undefined : Number(benchId), effectiveAtMs, note }, formRef.current);
    if (!input) return;
    move.mutate(
      { batchId: batch.id, input },
      {
        onSuccess: ({ batch: moved }) => {
          showToast(`${moved.variety} is now on ${moved.bench.benchName}`);
          onClose();
        },
        onError: (error) => showServerError(error, formRef.current),
      },
    );
  }

  return (
    <Dialog title={`Move ${batch.variety}`} onClose={onClose}>
      <form ref={formRef} onSubmit={onSubmit} noValidate aria-label={`Move ${batch.variety}`} className="flex flex-col gap-4">
        <p>
          Now on {batch.bench.benchName} · {batch.bench.zoneName}.
        </p>
        {errors.form && <Notice tone="error">{errors.form}</Notice>}
        <SelectField label="To bench" value={benchId} onChange={(e) => setBenchId(e.target.value)} error={errors.fields.benchId}>
          <option value="">Choose a bench</option>
          <BenchOptions groups={benchGroups} exceptId={batch.bench.benchId} />
        </SelectField>
        <TextField
          label="When it moved"
          hint="Leave empty for now"
          type="datetime-local"
          value={when}
          max={toLocalInput(Date.now())}
          onChange={(e) => setWhen(e.target.value)}
          error={errors.fields.effectiveAtMs}
        />
        <TextAreaField label="Why (optional)" rows={2} value={note} onChange={(e) => setNote(e.target.value)} error={errors.fields.note} />
        <div className="flex flex-wrap justify-end gap-3">
          <Button onClick={onClose}>Cancel</Button>
          <Button type="submit" variant="primary" isBusy={move.isPending}>
            Move
          </Button>
        </div>
      </form>
    </Dialog>
  );
}
