import { useState } from "react";
import { Link } from "react-router-dom";
import type { BatchStage } from "../../../../shared/domain/batch.js";
import { STAGE_LABELS, type BatchTallyView, type ObservationSummary, type ObservationView } from "../../../../shared/schemas/batches.js";
import { Button } from "../../../components/ui/button";
import { usePendingObservations } from "../api/record-observation";
import { formatCalendarDate, formatRate } from "../utils/batch-words";
import { ObservationLine } from "./observation-line";
import { QuickObservation, type PhotoKeeper } from "./quick-observation";

export type BenchBatch = {
  id: number;
  variety: string;
  stuckOn: string;
  ageDays: number;
  countStuck: number;
  stage: BatchStage;
  tally: BatchTallyView;
  lastObservation: ObservationSummary | null;
  observationsThisRound: ObservationView[];
};

type BatchOnBenchProps = {
  batch: BenchBatch;
  benchName: string;
  roundId: number | null;
  timeZone: string;
  /** Path of the batch's page. */
  batchHref: string;
  photoKeeper: PhotoKeeper;
  isOnline: boolean;
  /** False for viewers: no entry. */
  canRecord: boolean;
};

/**
 * A batch on a walk-through card: what it is and how it stands, what was recorded on it in this
 * round (stored, or waiting to send), and the quick entry.
 */
export function BatchOnBench({ batch, benchName, roundId, timeZone, batchHref, photoKeeper, isOnline, canRecord }: BatchOnBenchProps) {
  const [isEntering, setIsEntering] = useState(false);
  const pending = usePendingObservations(batch.id).filter((p) => p.variables.input.roundId === roundId);
  const stored = batch.observationsThisRound;
  const headingId = `batch-${batch.id}-heading`;

  return (
    <section aria-labelledby={headingId} data-batch-id={batch.id} className="flex flex-col gap-3 rounded-xl border-2 border-line bg-surface p-3">
      <div className="flex flex-wrap items-start justify-between gap-2">
        <div>
          <h4 id={headingId} className="text-xl font-bold">
            <Link to={batchHref} className="inline-flex min-h-touch items-center underline underline-offset-4">
              {batch.variety}
            </Link>
          </h4>
          <p className="text-base text-muted">
            Stuck {formatCalendarDate(batch.stuckOn)} · day {batch.ageDays} · {batch.countStuck} cuttings
          </p>
        </div>
        <div className="text-right">
          <p className="text-lg font-bold">{STAGE_LABELS[batch.stage]}</p>
          <p className="text-base">
            {batch.tally.rooted} rooted, {batch.tally.lost} lost · strike {formatRate(batch.tally.strikeRate)}
          </p>
        </div>
      </div>

      {(stored.length > 0 || pending.length > 0) && (
        <ul className="flex flex-col gap-2" aria-label={`Recorded on ${batch.variety} this round`}>
          {stored.map((o) => (
            <li key={o.id} className="rounded-lg border-l-8 border-ok bg-ok-soft p-3 text-ink">
              <p className="mb-1 text-base font-bold text-ok">Saved</p>
              <ObservationLine observation={o} subject={batch.variety} />
            </li>
          ))}
          {pending.map((p) => (
            <li key={p.variables.input.clientId} data-waiting="true" className="rounded-lg border-2 border-dashed border-high bg-high-soft p-3 text-ink">
              <p className="text-base font-bold">{isOnline && p.isSending ? "Sending…" : "Waiting to send"}</p>
              <p className="text-lg">{p.variables.detail}</p>
            </li>
          ))}
        </ul>
      )}

      {canRecord &&
        (isEntering ? (
          <QuickObservation
            batch={batch}
            benchName={benchName}
            roundId={roundId}
            timeZone={timeZone}
            photoKeeper={photoKeeper}
            isOnline={isOnline}
            onDone={() => setIsEntering(false)}
          />
        ) : (
          <Button onClick={() => setIsEntering(true)} className="min-h-14 w-full">
            {stored.length + pending.length > 0 ? "Record another observation" : "Record observation"}
            <span className="sr-only"> of {batch.variety}</span>
          </Button>
        ))}
    </section>
  );
}
