import { Suspense, useState } from "react";
import { auditEntityTypeSchema, type AuditEntityType, type AuditEntry } from "../../../../shared/schemas/audit.js";
import { Button } from "../../../components/ui/button";
import { Loading } from "../../../components/ui/loading";
import { SelectField } from "../../../components/ui/form";
import { formatDateTime } from "../../../lib/format-time";
import { useTemperatureUnit } from "../../../lib/temperature-unit";
import { useAudit, type AuditFilters } from "../api/get-audit";
import { useZoneAudit } from "../api/get-zone-audit";
import { actionWords, describeActor, describeChange, entityWords } from "../utils/format-change";

type AuditEntriesProps = {
  entries: readonly AuditEntry[];
  hasMore: boolean;
  isLoadingMore: boolean;
  onLoadMore: () => void;
  emptyText?: string;
};

/** Changes, newest first: who, when, what, and each field old → new in the reader's unit. */
export function AuditEntries({ entries, hasMore, isLoadingMore, onLoadMore, emptyText = "No changes recorded yet." }: AuditEntriesProps) {
  const { unit } = useTemperatureUnit();
  if (entries.length === 0) return <p className="text-lg text-muted">{emptyText}</p>;
  return (
    <div className="flex flex-col gap-3">
      <ol className="flex flex-col gap-3" aria-label="Changes, newest first">
        {entries.map((entry) => (
          <li key={entry.id} data-audit-id={entry.id} data-entity={entry.entityType} className="rounded-xl border-2 border-line bg-surface p-3">
            <p className="flex flex-wrap items-baseline gap-x-3 gap-y-1">
              <span className="font-bold">{entry.subject}</span>
              <span className="rounded-full bg-none-soft px-2 text-base font-semibold text-muted">
                {entityWords(entry.entityType)} · {actionWords(entry.action)}
              </span>
            </p>
            <p className="text-base text-muted">
              <time dateTime={new Date(entry.atMs).toISOString()}>{formatDateTime(entry.atMs)}</time> · {describeActor(entry.actor)}
            </p>
            {entry.note && <p className="mt-1 text-lg">{entry.note}</p>}
            {entry.changes.length > 0 && (
              <ul className="mt-2 flex flex-col gap-1 text-lg">
                {entry.changes.map((change, i) => {
                  const words = describeChange(change, unit);
                  const key = `${change.field}-${change.quantity ?? ""}-${i}`;
                  // Something created had nothing before, something deleted has nothing after: one side says it all.
                  if (entry.action === "created" || entry.action === "deleted") {
                    return (
                      <li key={key} data-field={change.field}>
                        <span className="font-semibold">{words.field}:</span> <span>{entry.action === "created" ? words.new : words.old}</span>
                      </li>
                    );
                  }
                  return (
                    <li key={key} data-field={change.field}>
                      <span className="font-semibold">{words.field}:</span> <span>{words.old}</span>{" "}
                      <span aria-label="changed to">→</span> <strong>{words.new}</strong>
                    </li>
                  );
                })}
              </ul>
            )}
          </li>
        ))}
      </ol>
      {hasMore && (
        <Button className="self-start" isBusy={isLoadingMore} onClick={onLoadMore}>
          Show older changes
        </Button>
      )}
    </div>
  );
}

/** One zone's trail (GET /api/zones/:id/audit), for the zone's settings page. */
export function ZoneAudit({ zoneId }: { zoneId: number }) {
  const query = useZoneAudit(zoneId);
  return (
    <AuditEntries
      entries={query.data.pages.flatMap((p) => p.entries)}
      hasMore={query.hasNextPage}
      isLoadingMore={query.isFetchingNextPage}
      onLoadMore={() => void query.fetchNextPage()}
      emptyText="Nothing in this zone has been changed yet."
    />
  );
}

type AuditLogProps = {
  /** Zones to filter by (the route has the layout). */
  zoneChoices: readonly { id: number; name: string }[];
  initialFilters?: AuditFilters;
};

/** Every change in one list (GET /api/audit), with filters by zone and by kind of thing changed. */
export function AuditLog({ zoneChoices, initialFilters = {} }: AuditLogProps) {
  const [filters, setFilters] = useState<AuditFilters>(initialFilters);
  return (
    <div className="flex flex-col gap-4">
      <div className="grid gap-3 sm:grid-cols-2">
        <SelectField
          label="Zone"
          value={filters.zoneId === undefined ? "" : String(filters.zoneId)}
          onChange={(e) => setFilters((f) => ({ ...f, zoneId: e.target.value ? Number(e.target.value) : undefined }))}
        >
          <option value="">Every zone</option>
          {zoneChoices.map((z) => (
            <option key={z.id} value={z.id}>
              {z.name}
            </option>
          ))}
        </SelectField>
        <SelectField
          label="What changed"
          value={filters.entityType ?? ""}
          onChange={(e) => setFilters((f) => ({ ...f, entityType: (e.target.value || undefined) as AuditEntityType | undefined }))}
        >
          <option value="">Everything</option>
          {auditEntityTypeSchema.options.map((t) => (
            <option key={t} value={t}>
              {entityWords(t)}
            </option>
          ))}
        </SelectField>
      </div>
      {/* A new filter loads while the filters stay in place. */}
      <Suspense fallback={<Loading label="Loading changes…" />}>
        <AuditLogEntries filters={filters} />
      </Suspense>
    </div>
  );
}

/** The changes matching fixed filters, e.g. one bench's (GET /api/audit?benchId=…). */
export function AuditLogEntries({ filters, emptyText = "No changes match." }: { filters: AuditFilters; emptyText?: string }) {
  const query = useAudit(filters);
  return (
    <AuditEntries
      entries={query.data.pages.flatMap((p) => p.entries)}
      hasMore={query.hasNextPage}
      isLoadingMore={query.isFetchingNextPage}
      onLoadMore={() => void query.fetchNextPage()}
      emptyText={emptyText}
    />
  );
}
