import { Link } from "react-router-dom";
import type { TemperatureUnit } from "../../../../shared/domain/units.js";
import type { AlertView } from "../../../../shared/schemas/alerts.js";
import { PhasePill } from "../../../components/ui/phase-pill";
import { Table, TableBody, TableHead, Td, Th, Tr } from "../../../components/ui/table";
import { paths } from "../../../config/paths";
import { alertTitle } from "../../../lib/alert-words";
import { describeAlertTime } from "../utils/alert-times";
import { AcknowledgeButton } from "./acknowledge-button";
import { AcknowledgedBy } from "./acknowledged-by";
import { AlertValue } from "./alert-value";

type AlertsTableProps = { alerts: readonly AlertView[]; unit: TemperatureUnit; nowMs: number; caption: string };

/**
 * Alerts as a table on a desktop and as one card per alert on a phone or tablet: what, where,
 * the value, since when, the phase in words and icon, who acknowledged, and "I've got it".
 */
export function AlertsTable({ alerts, unit, nowMs, caption }: AlertsTableProps) {
  return (
    <Table caption={caption} stackBelow="lg">
      <TableHead>
        <Th>Alert</Th>
        <Th>Bench</Th>
        <Th>Value</Th>
        <Th>When</Th>
        <Th>Phase</Th>
        <Th>Acknowledged</Th>
        <Th>
          <span className="sr-only">Actions</span>
        </Th>
      </TableHead>
      <TableBody>
        {alerts.map((alert) => {
          const time = describeAlertTime(alert, nowMs);
          return (
            <Tr key={alert.id} data-alert-id={alert.id} data-phase={alert.phase} className={alert.phase === "raised" ? "max-lg:border-high" : ""}>
              <Td label="Alert">
                <Link
                  to={paths.alert.to(alert.id)}
                  className="inline-flex min-h-touch items-center text-xl font-bold text-accent underline underline-offset-4"
                >
                  {alertTitle(alert)}
                </Link>
              </Td>
              <Td label="Bench">
                <span className="flex flex-col">
                  <strong>{alert.benchName}</strong>
                  <span className="text-base text-muted">{alert.zoneName}</span>
                </span>
              </Td>
              <Td label="Value">
                <AlertValue alert={alert} unit={unit} />
              </Td>
              <Td label="When">
                <span className="flex flex-col">
                  <span>{time.since}</span>
                  <span className="text-base text-muted">{time.isOver ? `out for ${time.duration}` : `${time.duration} so far`}</span>
                </span>
              </Td>
              <Td label="Phase">
                <PhasePill phase={alert.phase} />
              </Td>
              <Td label="Acknowledged">
                <AcknowledgedBy alert={alert} nowMs={nowMs} />
              </Td>
              <Td label="" className="max-lg:before:hidden lg:text-right">
                <AcknowledgeButton alert={alert} className="max-lg:w-full" />
              </Td>
            </Tr>
          );
        })}
      </TableBody>
    </Table>
  );
}
