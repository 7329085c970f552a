import { FLAG_LABELS, STAGE_LABELS, type BenchObservation } from "../../../../shared/schemas/batches.js";
import { formatCalendarDate } from "../../../features/batches/utils/batch-words";
import type { ObservationMarker } from "../../../features/readings/components/observation-lane";
import { formatDateTime } from "../../../lib/format-time";

/**
 * Walk-through observations as history-chart marks, in the words a grower reads on the batch
 * page: when, the variety and stage, counts so far, flags, note and who. On a zone's charts each
 * names its bench too.
 */
export function observationMarkers(observations: readonly BenchObservation[], { withBench }: { withBench: boolean }): ObservationMarker[] {
  return observations.map((o) => {
    const counts = [o.rootedCount !== null ? `${o.rootedCount} rooted` : null, o.lostCount !== null ? `${o.lostCount} lost` : null].filter(Boolean);
    return {
      id: String(o.id),
      timeMs: o.timeMs,
      // Entered on a later day: only the date is known, and the mark sits at midday.
      when: o.isDateOnly ? `${formatCalendarDate(o.observedOn)} (entered later, no time)` : formatDateTime(o.timeMs),
      title: `${o.variety} · ${STAGE_LABELS[o.stage]}`,
      details: [
        withBench ? o.benchName : null,
        counts.length > 0 ? `${counts.join(", ")} so far, of ${o.countStuck} stuck` : null,
        o.flags.length > 0 ? `Flagged: ${o.flags.map((f) => FLAG_LABELS[f]).join(", ")}` : "Nothing flagged",
        o.note ? `“${o.note}”` : null,
        `Seen by ${o.recordedByName}`,
      ].filter((line): line is string => line !== null),
      isFlagged: o.flags.length > 0,
    };
  });
}
