import type { TemperatureUnit } from "../../../../shared/domain/units.js";
import type { WindowedQuantity } from "../../../../shared/schemas/quantities.js";
import type { QuantityWindow, WindowLimitField } from "../../../../shared/schemas/windows.js";
import { Table, TableBody, TableHead, Td, Th, Tr } from "../../../components/ui/table";
import { QUANTITY_LABELS } from "../../../lib/quantity-labels";
import { FIELD_LABELS, LIMIT_FIELDS, formatFieldValue, formatMargin } from "../utils/window-values";

export type WindowViewRow = {
  quantity: WindowedQuantity;
  window: QuantityWindow | null;
  /** Bench views: where the window in force comes from. */
  source?: "zone" | "bench" | "none";
  /** Bench views: the fields where the bench's own window differs from the zone's. */
  differingFields?: readonly WindowLimitField[];
};

const SOURCE_WORDS = { zone: "Zone", bench: "This bench", none: "—" } as const;

type WindowSetViewProps = {
  caption: string;
  rows: readonly WindowViewRow[];
  margin: { valueC: number; source?: "zone" | "bench"; differsFromZone?: boolean };
  unit: TemperatureUnit;
};

/** A window set as text, for reading (growers and viewers, presets): no control anywhere. */
export function WindowSetView({ caption, rows, margin, unit }: WindowSetViewProps) {
  const hasSource = rows.some((r) => r.source !== undefined);
  return (
    <div className="flex flex-col gap-3" data-testid="window-set-view">
      <Table caption={caption} stackBelow="lg">
        <TableHead>
          <Th>Quantity</Th>
          {LIMIT_FIELDS.map((f) => (
            <Th key={f}>{FIELD_LABELS[f]}</Th>
          ))}
          {hasSource && <Th>Comes from</Th>}
        </TableHead>
        <TableBody>
          {rows.map((row) => (
            <Tr key={row.quantity} data-quantity={row.quantity} data-source={row.source}>
              <Td label="Quantity" className="font-bold">
                {QUANTITY_LABELS[row.quantity]}
              </Td>
              {LIMIT_FIELDS.map((f) => {
                const isDifferent = row.differingFields?.includes(f) ?? false;
                return (
                  <Td key={f} label={FIELD_LABELS[f]} data-differs={isDifferent || undefined} className={isDifferent ? "font-bold" : ""}>
                    {row.window ? formatFieldValue(row.quantity, f, row.window[f], unit) : "Not watched"}
                    {isDifferent && <span className="ml-2 rounded bg-accent px-1.5 text-base font-semibold text-page">Differs from zone</span>}
                  </Td>
                );
              })}
              {hasSource && <Td label="Comes from">{row.source ? SOURCE_WORDS[row.source] : ""}</Td>}
            </Tr>
          ))}
        </TableBody>
      </Table>
      <p className="text-lg">
        {FIELD_LABELS.dewPointMarginC}: <strong>{formatMargin(margin.valueC, unit)}</strong>
        {margin.source === "bench" && " (this bench)"}
        {margin.source === "zone" && " (zone)"}
        {margin.differsFromZone && <span className="ml-2 rounded bg-accent px-1.5 text-base font-semibold text-page">Differs from zone</span>}
      </p>
    </div>
  );
}
