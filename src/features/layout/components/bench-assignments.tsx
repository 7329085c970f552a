import { Table, TableBody, TableHead, Td, Th, Tr } from "../../../components/ui/table";
import { formatDateTime } from "../../../lib/format-time";
import { useBenchAssignments } from "../api/get-bench-assignments";

/**
 * The sensors that have been on a bench, each stretch from → to. Readings taken in a stretch stay
 * with this bench even after the probe moves on.
 */
export function BenchAssignments({ benchId }: { benchId: number }) {
  const { data } = useBenchAssignments(benchId);
  if (data.assignments.length === 0) return <p className="text-lg text-muted">No sensor has been on this bench yet.</p>;
  return (
    <Table caption="Sensors on this bench over time, newest first">
      <TableHead>
        <Th>Sensor</Th>
        <Th>From</Th>
        <Th>Until</Th>
      </TableHead>
      <TableBody>
        {data.assignments.map((a) => (
          <Tr key={a.id}>
            <Td label="Sensor" className="font-semibold">
              {a.sensorId}
            </Td>
            <Td label="From">{formatDateTime(a.fromMs)}</Td>
            <Td label="Until">{a.toMs === null ? <strong>Still here</strong> : formatDateTime(a.toMs)}</Td>
          </Tr>
        ))}
      </TableBody>
    </Table>
  );
}
