import { BASE_TREATMENT_LABELS, OUTCOME_LABELS, STAGE_LABELS, WRAPPING_LABELS, type BatchView } from "../../../../shared/schemas/batches.js";
import { formatDateTime } from "../../../lib/format-time";
import { formatCalendarDate, formatDays, formatRate } from "../utils/batch-words";

function Figure({ label, value, detail }: { label: string; value: string; detail?: string }) {
  return (
    <div className="rounded-xl border-2 border-line bg-surface p-3">
      <dt className="text-base font-semibold text-muted">{label}</dt>
      <dd>
        <span className="text-4xl font-bold tabular-nums">{value}</span>
        {detail && <span className="block text-base">{detail}</span>}
      </dd>
    </div>
  );
}

/** A batch's figures (strike rate from the shared batch arithmetic, days to callus and roots) and its recorded fields. */
export function BatchFacts({ batch }: { batch: BatchView }) {
  const t = batch.tally;
  const fields: [string, string][] = [
    ["Source of the wood", batch.woodSource ?? "—"],
    ["Date stuck", formatCalendarDate(batch.stuckOn)],
    ["Cuttings stuck", String(batch.countStuck)],
    ["Thickness", batch.thicknessMm === null ? "—" : `${batch.thicknessMm} mm`],
    ["Buds above the medium", batch.budsAboveMedium === null ? "—" : String(batch.budsAboveMedium)],
    ["Base treatment", batch.baseTreatments.length === 0 ? "—" : batch.baseTreatments.map((b) => BASE_TREATMENT_LABELS[b]).join(", ")],
    ["Hormone", batch.hormoneProduct ?? "—"],
    ["Wrapping", batch.wrapping ? WRAPPING_LABELS[batch.wrapping] : "—"],
    ["Notes", batch.notes ?? "—"],
    ["Recorded by", `${batch.createdByName}, ${formatDateTime(batch.createdAtMs)}`],
  ];
  return (
    <div className="flex flex-col gap-5">
      <dl className="grid grid-cols-2 gap-3 md:grid-cols-4">
        <Figure label="Strike rate" value={formatRate(t.strikeRate)} detail={`${t.rooted} rooted of ${t.stuck}${t.isFinal ? " (final)" : " so far"}`} />
        <Figure label="Lost" value={formatRate(t.lossRate)} detail={`${t.lost} cuttings`} />
        <Figure label="Stage" value={STAGE_LABELS[batch.stage]} detail={batch.status === "closed" && batch.outcome ? `Closed ${batch.closedOn ?? ""}: ${OUTCOME_LABELS[batch.outcome].toLowerCase()}` : `Day ${batch.ageDays}`} />
        <Figure label="Pending" value={String(t.pending)} detail="neither rooted nor lost" />
      </dl>
      <dl className="grid grid-cols-3 gap-3">
        <Figure label="Days to callus" value={formatDays(batch.daysToCallus)} />
        <Figure label="Days to root initials" value={formatDays(batch.daysToRootInitials)} />
        <Figure label="Days to rooted" value={formatDays(batch.daysToRooted)} />
      </dl>
      <dl className="grid gap-x-6 gap-y-2 sm:grid-cols-2">
        {fields.map(([label, value]) => (
          <div key={label} className="border-b border-line py-1">
            <dt className="text-base font-semibold text-muted">{label}</dt>
            <dd className="text-lg">{value}</dd>
          </div>
        ))}
      </dl>
      {batch.closeNote && <p className="text-lg">Closing note: “{batch.closeNote}”</p>}
    </div>
  );
}

/** Every bench the batch sat on, oldest first, with who moved it and why. */
export function PlacementHistory({ batch }: { batch: BatchView }) {
  return (
    <ol className="flex flex-col gap-2">
      {batch.placements.map((p, i) => (
        <li key={`${p.benchId}-${p.fromMs}`} className="rounded-lg border-2 border-line bg-surface p-3">
          <p className="text-lg font-bold">
            {p.benchName} · {p.zoneName}
          </p>
          <p className="text-base">
            {formatDateTime(p.fromMs)} → {p.toMs === null ? "now" : formatDateTime(p.toMs)}
            {i > 0 && p.movedByName ? ` · moved by ${p.movedByName}` : ""}
            {p.note ? ` — “${p.note}”` : ""}
          </p>
        </li>
      ))}
    </ol>
  );
}
