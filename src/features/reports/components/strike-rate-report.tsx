import { Link } from "react-router-dom";
import { WINDOWED_QUANTITIES, type WindowedQuantity } from "../../../../shared/schemas/quantities.js";
import { OUTCOME_LABELS, STAGE_LABELS, type BatchReportRow, type GroupReportRow, type StrikeRateReport } from "../../../../shared/schemas/batches.js";
import { Table, TableBody, TableHead, Td, Th, Tr } from "../../../components/ui/table";
import { QUANTITY_SHORT_LABELS } from "../../../lib/quantity-labels";

function rate(r: number | null): string {
  return r === null ? "—" : `${Math.round(r * 100)} %`;
}

function pct(p: number | null | undefined): string {
  return p === null || p === undefined ? "—" : `${Math.round(p)} %`;
}

function days(d: number | null | undefined): string {
  return d === null || d === undefined ? "—" : `${Math.round(d * 10) / 10} d`;
}

/** Higher strike rates first; batches without a rate last. */
function byStrikeRate<T>(rateOf: (row: T) => number | null) {
  return (a: T, b: T) => (rateOf(b) ?? -1) - (rateOf(a) ?? -1);
}

/** Share of time in window per quantity, four small figures side by side. */
function TimeInWindow({ values }: { values: readonly { quantity: WindowedQuantity; insidePct: number | null }[] }) {
  return (
    <dl className="grid grid-cols-2 gap-x-4 gap-y-0.5 text-base sm:grid-cols-4">
      {WINDOWED_QUANTITIES.map((q) => {
        const v = values.find((x) => x.quantity === q)?.insidePct ?? null;
        return (
          <div key={q} className="flex flex-col">
            <dt className="text-sm text-muted">{QUANTITY_SHORT_LABELS[q]}</dt>
            <dd className={`font-bold tabular-nums ${v !== null && v < 90 ? "text-high" : ""}`}>{pct(v)}</dd>
          </div>
        );
      })}
    </dl>
  );
}

function BatchRows({ rows, batchHref }: { rows: readonly BatchReportRow[]; batchHref: (id: number) => string }) {
  return (
    <Table caption="Strike rate per batch" stackBelow="lg">
      <TableHead>
        <Th>Batch</Th>
        <Th>Stuck</Th>
        <Th className="text-right">Strike rate</Th>
        <Th>Days to callus · initials · rooted</Th>
        <Th>Time in window</Th>
      </TableHead>
      <TableBody>
        {[...rows].sort(byStrikeRate((r) => r.tally.strikeRate)).map((r) => (
          <Tr key={r.batchId} data-batch-id={r.batchId}>
            <Td label="Batch">
              <Link to={batchHref(r.batchId)} className="text-lg font-bold underline underline-offset-4">
                {r.variety}
              </Link>
              <span className="block text-base">
                {r.mainBench.benchName} · {r.mainBench.zoneName}
              </span>
            </Td>
            <Td label="Stuck">
              {r.stuckOn}
              <span className="block text-base text-muted">
                {r.status === "closed" && r.outcome ? OUTCOME_LABELS[r.outcome] : STAGE_LABELS[r.stage]} · day {r.ageDays}
              </span>
            </Td>
            <Td label="Strike rate" className="lg:text-right">
              <span className="text-2xl font-bold tabular-nums">{rate(r.tally.strikeRate)}</span>
              <span className="block text-base tabular-nums">
                {r.tally.rooted} of {r.tally.stuck}, {r.tally.lost} lost
              </span>
            </Td>
            <Td label="Days" className="tabular-nums">
              {days(r.daysToCallus)} · {days(r.daysToRootInitials)} · {days(r.daysToRooted)}
            </Td>
            <Td label="In window">
              <TimeInWindow values={r.timeInWindow} />
              {r.sampled && <span className="text-sm text-muted">read as means: short dips may be smoothed</span>}
            </Td>
          </Tr>
        ))}
      </TableBody>
    </Table>
  );
}

function GroupRows({ caption, firstColumn, rows }: { caption: string; firstColumn: string; rows: readonly GroupReportRow[] }) {
  return (
    <Table caption={caption} stackBelow="lg">
      <TableHead>
        <Th>{firstColumn}</Th>
        <Th className="text-right">Strike rate</Th>
        <Th>Median days to callus · initials · rooted</Th>
        <Th>Time in window</Th>
      </TableHead>
      <TableBody>
        {[...rows].sort(byStrikeRate((r) => r.strikeRate)).map((r) => (
          <Tr key={r.key}>
            <Td label={firstColumn}>
              <span className="text-lg font-bold">{r.label}</span>
              <span className="block text-base">{r.batchCount === 1 ? "1 batch" : `${r.batchCount} batches`}</span>
            </Td>
            <Td label="Strike rate" className="lg:text-right">
              <span className="text-2xl font-bold tabular-nums">{rate(r.strikeRate)}</span>
              <span className="block text-base tabular-nums">
                {r.rooted} of {r.stuck}, {r.lost} lost
              </span>
            </Td>
            <Td label="Days" className="tabular-nums">
              {days(r.daysToCallus.medianDays)} · {days(r.daysToRootInitials.medianDays)} · {days(r.daysToRooted.medianDays)}
              <span className="block text-sm text-muted">
                reached by {r.daysToCallus.reached} · {r.daysToRootInitials.reached} · {r.daysToRooted.reached} of {r.batchCount}
              </span>
            </Td>
            <Td label="In window">
              <TimeInWindow values={r.timeInWindow} />
            </Td>
          </Tr>
        ))}
      </TableBody>
    </Table>
  );
}

/**
 * Strike rate beside days to callus and roots and the share of time each bench was in its window
 * during the batches' lives: per batch, per variety, per bench. Best first, so what good batches
 * had in common reads down the columns.
 */
export function StrikeRateReportView({ report, batchHref }: { report: StrikeRateReport; batchHref: (id: number) => string }) {
  if (report.batches.length === 0) return <p className="py-6 text-lg text-muted">No batch matches these filters.</p>;
  return (
    <div className="flex flex-col gap-8">
      <section aria-labelledby="report-variety">
        <h2 id="report-variety" className="mb-2 text-2xl font-bold">
          By variety
        </h2>
        <GroupRows caption="Strike rate per variety" firstColumn="Variety" rows={report.byVariety} />
      </section>
      <section aria-labelledby="report-bench">
        <h2 id="report-bench" className="mb-2 text-2xl font-bold">
          By bench
        </h2>
        <GroupRows caption="Strike rate per bench" firstColumn="Bench" rows={report.byBench} />
      </section>
      <section aria-labelledby="report-batch">
        <h2 id="report-batch" className="mb-2 text-2xl font-bold">
          By batch
        </h2>
        <BatchRows rows={report.batches} batchHref={batchHref} />
      </section>
    </div>
  );
}
