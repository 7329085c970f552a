import type { QueryClient } from "@tanstack/react-query";
import { useState, type FormEvent } from "react";
import { useSearchParams, type LoaderFunction } from "react-router-dom";
import { calendarDayNumber } from "../../../../shared/domain/batch.js";
import { RouteError } from "../../../components/errors/route-error";
import { Button, buttonClasses } from "../../../components/ui/button";
import { SelectField, TextField } from "../../../components/ui/form";
import { paths } from "../../../config/paths";
import { getLayoutQueryOptions, useLayout } from "../../../features/layout/api/get-layout";
import { batchesCsvUrl, observationsCsvUrl } from "../../../features/reports/api/export-urls";
import { getStrikeRatesQueryOptions, useStrikeRates, type ReportFilters } from "../../../features/reports/api/get-strike-rates";
import { StrikeRateReportView } from "../../../features/reports/components/strike-rate-report";

const isDate = (v: string | null): v is string => v !== null && calendarDayNumber(v) !== undefined;

function filtersFrom(search: URLSearchParams): ReportFilters {
  const status = search.get("status");
  const zone = Number(search.get("zone"));
  const variety = search.get("variety")?.trim();
  const from = search.get("from");
  const to = search.get("to");
  return {
    status: status === "open" || status === "closed" ? status : "all",
    ...(Number.isSafeInteger(zone) && zone > 0 ? { zoneId: zone } : {}),
    ...(variety ? { variety } : {}),
    ...(isDate(from) ? { stuckFrom: from } : {}),
    ...(isDate(to) ? { stuckTo: to } : {}),
  };
}

function toSearch(f: ReportFilters): URLSearchParams {
  const s = new URLSearchParams();
  if (f.status !== "all") s.set("status", f.status);
  if (f.zoneId !== undefined) s.set("zone", String(f.zoneId));
  if (f.variety) s.set("variety", f.variety);
  if (f.stuckFrom) s.set("from", f.stuckFrom);
  if (f.stuckTo) s.set("to", f.stuckTo);
  return s;
}

export const clientLoader =
  (queryClient: QueryClient): LoaderFunction =>
  async ({ request }) => {
    const filters = filtersFrom(new URL(request.url).searchParams);
    await Promise.all([queryClient.ensureQueryData(getStrikeRatesQueryOptions(filters)), queryClient.ensureQueryData(getLayoutQueryOptions())]);
    return null;
  };

/** `/reports`: strike rate, days to callus and roots, and time in window per batch, variety and bench; CSV exports. */
export default function ReportsRoute() {
  const [search, setSearch] = useSearchParams();
  const filters = filtersFrom(search);
  const { data: report } = useStrikeRates(filters);
  const { data: layout } = useLayout();
  const [draft, setDraft] = useState({ variety: filters.variety ?? "", from: filters.stuckFrom ?? "", to: filters.stuckTo ?? "" });
  const zones = layout.zones.filter((z) => z.archivedAtMs === null);
  const go = (next: ReportFilters) => setSearch(toSearch(next), { replace: true });

  function onApply(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    go({ ...filters, variety: draft.variety.trim() || undefined, stuckFrom: isDate(draft.from) ? draft.from : undefined, stuckTo: isDate(draft.to) ? draft.to : undefined });
  }

  return (
    <div className="flex flex-col gap-5">
      <title>Reports · Benchwarden</title>
      <div className="flex flex-wrap items-center justify-between gap-3">
        <h1 className="text-3xl font-bold">Strike rates</h1>
        <div className="flex flex-wrap gap-2">
          <a href={batchesCsvUrl(filters)} download className={buttonClasses("secondary")}>
            <span aria-hidden="true">⤓</span> Batches CSV
          </a>
          <a href={observationsCsvUrl(filters)} download className={buttonClasses("secondary")}>
            <span aria-hidden="true">⤓</span> Observations CSV
          </a>
        </div>
      </div>
      <p className="text-lg text-muted">
        Strike rate is rooted cuttings over cuttings stuck. Time in window is the share of each batch&apos;s life, on the benches it sat on, that the readings were inside the window (of
        the time with data).
      </p>
      <form onSubmit={onApply} aria-label="Report filters" className="flex flex-wrap items-end gap-4">
        <SelectField label="Batches" value={filters.status} onChange={(e) => go({ ...filters, status: e.target.value as ReportFilters["status"] })}>
          <option value="all">All</option>
          <option value="open">Open</option>
          <option value="closed">Closed</option>
        </SelectField>
        <SelectField
          label="Zone"
          className="min-w-56"
          value={filters.zoneId === undefined ? "" : String(filters.zoneId)}
          onChange={(e) => go({ ...filters, zoneId: e.target.value === "" ? undefined : Number(e.target.value) })}
        >
          <option value="">Every zone</option>
          {zones.map((z) => (
            <option key={z.id} value={z.id}>
              {z.name}
            </option>
          ))}
        </SelectField>
        <TextField label="Variety" value={draft.variety} onChange={(e) => setDraft({ ...draft, variety: e.target.value })} />
        <TextField label="Stuck from" type="date" value={draft.from} onChange={(e) => setDraft({ ...draft, from: e.target.value })} />
        <TextField label="Stuck to" type="date" value={draft.to} onChange={(e) => setDraft({ ...draft, to: e.target.value })} />
        <Button type="submit">Apply</Button>
      </form>
      <StrikeRateReportView report={report} batchHref={paths.batch.to} />
    </div>
  );
}

export const ErrorBoundary = RouteError;
