import { Link } from "react-router-dom";
import { STAGE_LABELS, type BatchView } from "../../../../shared/schemas/batches.js";
import { Table, TableBody, TableHead, Td, Th, Tr } from "../../../components/ui/table";
import { formatCalendarDate, formatRate } from "../utils/batch-words";

/** Batches as rows (cards on a portrait tablet): variety, bench, stuck, stage, counts, strike rate. */
export function BatchTable({ batches, batchHref }: { batches: readonly BatchView[]; batchHref: (id: number) => string }) {
  if (batches.length === 0) return <p className="py-6 text-lg text-muted">No batch matches.</p>;
  return (
    <Table caption="Batches" stackBelow="lg">
      <TableHead>
        <Th>Variety</Th>
        <Th>Bench</Th>
        <Th>Stuck</Th>
        <Th>Stage</Th>
        <Th className="text-right">Rooted / lost / stuck</Th>
        <Th className="text-right">Strike rate</Th>
      </TableHead>
      <TableBody>
        {batches.map((b) => (
          <Tr key={b.id} data-batch-id={b.id}>
            <Td label="Variety">
              <Link to={batchHref(b.id)} className="inline-flex min-h-touch items-center text-xl font-bold underline underline-offset-4">
                {b.variety}
              </Link>
            </Td>
            <Td label="Bench">
              {b.bench.benchName} · {b.bench.zoneName}
            </Td>
            <Td label="Stuck">
              {formatCalendarDate(b.stuckOn)} <span className="text-base text-muted">(day {b.ageDays})</span>
            </Td>
            <Td label="Stage">
              <span className="font-semibold">{b.status === "closed" ? `Closed · ${STAGE_LABELS[b.stage]}` : STAGE_LABELS[b.stage]}</span>
            </Td>
            <Td label="Counts" className="tabular-nums lg:text-right">
              {b.tally.rooted} / {b.tally.lost} / {b.tally.stuck}
            </Td>
            <Td label="Strike rate" className="text-xl font-bold tabular-nums lg:text-right">
              {formatRate(b.tally.strikeRate)}
            </Td>
          </Tr>
        ))}
      </TableBody>
    </Table>
  );
}
