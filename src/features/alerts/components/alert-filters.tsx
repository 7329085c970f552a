import { useId, useState } from "react";
import { Link } from "react-router-dom";
import { alertKindSchema, type AlertKind, type AlertPhase } from "../../../../shared/schemas/alerts.js";
import { SelectField } from "../../../components/ui/form";
import { paths } from "../../../config/paths";
import { KIND_LABELS, OPEN_PHASES, PHASE_LABELS } from "../../../lib/alert-words";

export type AlertsTab = "open" | "past";

export type AlertsPageFilters = { tab: AlertsTab; zoneId?: number; phase?: AlertPhase; kind?: AlertKind };

type AlertFiltersProps = {
  filters: AlertsPageFilters;
  zones: readonly { id: number; name: string }[];
  onChange: (next: AlertsPageFilters) => void;
};

const ANY = "";

/** Open / past as two tabs (links, so each has its own address), then zone, phase and kind. */
export function AlertFilters({ filters, zones, onChange }: AlertFiltersProps) {
  // On a phone the three selects fold away behind one button, so the list starts near the top.
  const [isOpen, setIsOpen] = useState(false);
  const panelId = useId();
  const activeCount = [filters.zoneId, filters.tab === "open" ? filters.phase : undefined, filters.kind].filter((v) => v !== undefined).length;
  return (
    <div className="flex flex-col gap-4">
      <nav aria-label="Open or past alerts">
        <ul className="inline-flex rounded-lg border-2 border-line bg-surface p-0.5">
          {(["open", "past"] as const).map((tab) => {
            const isCurrent = filters.tab === tab;
            return (
              <li key={tab}>
                <Link
                  to={paths.alerts.to({ tab, zoneId: filters.zoneId, kind: filters.kind })}
                  aria-current={isCurrent ? "page" : undefined}
                  className={`inline-flex min-h-touch min-w-touch items-center rounded-md px-4 text-lg font-bold ${
                    isCurrent ? "bg-ink text-page" : "text-muted hover:text-ink"
                  }`}
                >
                  {tab === "open" ? "Open" : "Past"}
                </Link>
              </li>
            );
          })}
        </ul>
      </nav>
      <button
        type="button"
        aria-expanded={isOpen}
        aria-controls={panelId}
        onClick={() => setIsOpen((open) => !open)}
        className="inline-flex min-h-touch items-center gap-2 self-start rounded-lg border-2 border-line bg-surface px-4 text-lg font-semibold sm:hidden"
      >
        <span aria-hidden="true">{isOpen ? "▾" : "▸"}</span>
        Filters{activeCount > 0 ? ` (${activeCount} on)` : ""}
      </button>
      <div id={panelId} className={`${isOpen ? "grid" : "hidden"} gap-3 sm:grid sm:grid-cols-3`}>
        <SelectField
          label="Zone"
          value={filters.zoneId?.toString() ?? ANY}
          onChange={(e) => onChange({ ...filters, zoneId: e.target.value === ANY ? undefined : Number(e.target.value) })}
        >
          <option value={ANY}>Every zone</option>
          {zones.map((zone) => (
            <option key={zone.id} value={zone.id}>
              {zone.name}
            </option>
          ))}
        </SelectField>
        {filters.tab === "open" ? (
          <SelectField
            label="Phase"
            value={filters.phase ?? ANY}
            onChange={(e) => onChange({ ...filters, phase: e.target.value === ANY ? undefined : (e.target.value as AlertPhase) })}
          >
            <option value={ANY}>Any open phase</option>
            {OPEN_PHASES.map((phase) => (
              <option key={phase} value={phase}>
                {PHASE_LABELS[phase]}
              </option>
            ))}
          </SelectField>
        ) : (
          // Past alerts have all cleared; a phase filter would offer one choice.
          <div className="hidden sm:block" aria-hidden="true" />
        )}
        <SelectField
          label="Kind"
          value={filters.kind ?? ANY}
          onChange={(e) => onChange({ ...filters, kind: e.target.value === ANY ? undefined : (e.target.value as AlertKind) })}
        >
          <option value={ANY}>Every kind</option>
          {alertKindSchema.options.map((kind) => (
            <option key={kind} value={kind}>
              {KIND_LABELS[kind]}
            </option>
          ))}
        </SelectField>
      </div>
    </div>
  );
}
