import { useRef, useState, type FormEvent } from "react";
import { checkBatchCounts } from "../../../../shared/domain/batch.js";
import { BATCH_OUTCOMES, closeBatchInputSchema, OUTCOME_LABELS, type BatchOutcome, type BatchView } from "../../../../shared/schemas/batches.js";
import { Button } from "../../../components/ui/button";
import { Dialog } from "../../../components/ui/dialog";
import { ChoiceField, TextAreaField, TextField } from "../../../components/ui/form";
import { Notice } from "../../../components/ui/notice";
import { useToast } from "../../../components/ui/toast";
import { useFormErrors } from "../../../lib/form";
import { useCloseBatch } from "../api/close-batch";
import { HandlingCautions } from "./cautions";

const FIELDS = ["outcome", "closedOn", "rootedCount", "lostCount", "note"] as const;

const OUTCOME_DESCRIPTIONS: Record<BatchOutcome, string> = {
  "potted-on": "Rooted cuttings went on into pots",
  lost: "The batch failed",
  discarded: "Thrown away for another reason",
};

/** Close a batch with its outcome and final counts (they default to the latest observation's). */
export function CloseBatchDialog({ batch, today, onClose }: { batch: BatchView; today: string; onClose: () => void }) {
  const formRef = useRef<HTMLFormElement>(null);
  const [outcome, setOutcome] = useState<BatchOutcome>("potted-on");
  const [closedOn, setClosedOn] = useState(today);
  const [rooted, setRooted] = useState(String(batch.tally.rooted));
  const [lost, setLost] = useState(String(batch.tally.lost));
  const [note, setNote] = useState("");
  const { errors, validate, showServerError } = useFormErrors({ fields: FIELDS });
  const close = useCloseBatch();
  const { showToast } = useToast();

  function onSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const input = validate(
      closeBatchInputSchema,
      { outcome, closedOn, rootedCount: rooted.trim() === "" ? undefined : Number(rooted), lostCount: lost.trim() === "" ? undefined : Number(lost), note },
      formRef.current,
    );
    if (!input) return;
    const counts = checkBatchCounts({ stuck: batch.countStuck, rooted: input.rootedCount ?? batch.tally.rooted, lost: input.lostCount ?? batch.tally.lost });
    // The fields already say so (overStuck below); nothing is sent.
    if (!counts.ok) return;
    close.mutate(
      { batchId: batch.id, input },
      {
        onSuccess: () => {
          showToast(`${batch.variety} is closed: ${OUTCOME_LABELS[outcome].toLowerCase()}`);
          onClose();
        },
        onError: (error) => showServerError(error, formRef.current),
      },
    );
  }

  const rootedN = Number(rooted);
  const lostN = Number(lost);
  const overStuck = Number.isFinite(rootedN) && Number.isFinite(lostN) && rootedN + lostN > batch.countStuck;

  return (
    <Dialog title={`Close ${batch.variety}`} onClose={onClose}>
      <form ref={formRef} onSubmit={onSubmit} noValidate aria-label={`Close ${batch.variety}`} className="flex flex-col gap-4">
        {errors.form && <Notice tone="error">{errors.form}</Notice>}
        <ChoiceField legend="Outcome" name="outcome" value={outcome} options={BATCH_OUTCOMES.map((o) => ({ value: o, label: OUTCOME_LABELS[o], description: OUTCOME_DESCRIPTIONS[o] }))} onChange={setOutcome} error={errors.fields.outcome} />
        <TextField label="Closed on" type="date" value={closedOn} max={today} onChange={(e) => setClosedOn(e.target.value)} error={errors.fields.closedOn} />
        <div className="grid gap-3 sm:grid-cols-2">
          <TextField label="Rooted in the end" inputMode="numeric" value={rooted} onChange={(e) => setRooted(e.target.value)} error={errors.fields.rootedCount ?? (overStuck ? `More than the ${batch.countStuck} stuck` : undefined)} />
          <TextField label="Lost in the end" inputMode="numeric" value={lost} onChange={(e) => setLost(e.target.value)} error={errors.fields.lostCount ?? (overStuck ? `More than the ${batch.countStuck} stuck` : undefined)} />
        </div>
        <TextAreaField label="Note (optional)" rows={2} value={note} onChange={(e) => setNote(e.target.value)} error={errors.fields.note} />
        {outcome === "potted-on" && <HandlingCautions showHormone={false} />}
        <div className="flex flex-wrap justify-end gap-3">
          <Button onClick={onClose}>Cancel</Button>
          <Button type="submit" variant="primary" isBusy={close.isPending}>
            Close the batch
          </Button>
        </div>
      </form>
    </Dialog>
  );
}
