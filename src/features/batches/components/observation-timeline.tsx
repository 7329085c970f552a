import type { ObservationView } from "../../../../shared/schemas/batches.js";
import { usePendingObservations } from "../api/record-observation";
import { formatCalendarDate } from "../utils/batch-words";
import { ObservationLine } from "./observation-line";

/** A batch's observations over time, newest first, with photos; those entered here and not yet sent on top. */
export function ObservationTimeline({ batchId, variety, observations }: { batchId: number; variety: string; observations: readonly ObservationView[] }) {
  const pending = usePendingObservations(batchId);
  const newestFirst = [...observations].reverse();
  if (newestFirst.length === 0 && pending.length === 0) return <p className="text-lg text-muted">No observation yet.</p>;
  return (
    <ol className="flex flex-col gap-3">
      {pending.map((p) => (
        <li key={p.variables.input.clientId} className="rounded-xl border-2 border-dashed border-high bg-high-soft p-3">
          <p className="text-base font-bold">Waiting to send</p>
          <p className="text-lg">{p.variables.detail}</p>
        </li>
      ))}
      {newestFirst.map((o) => (
        <li key={o.id} className="rounded-xl border-2 border-line bg-surface p-3">
          <p className="text-base font-semibold text-muted">
            {formatCalendarDate(o.observedOn)}
            {o.roundId !== null ? " · walk-through" : ""}
          </p>
          <ObservationLine observation={o} subject={variety} />
        </li>
      ))}
    </ol>
  );
}
