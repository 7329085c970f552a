import type { QueryClient } from "@tanstack/react-query";
import { useState, type FormEvent } from "react";
import { useSearchParams, type LoaderFunction } from "react-router-dom";
import { RouteError } from "../../../components/errors/route-error";
import { Button } from "../../../components/ui/button";
import { SelectField, TextField } from "../../../components/ui/form";
import { LinkButton } from "../../../components/ui/link-button";
import { SegmentedControl } from "../../../components/ui/segmented-control";
import { paths } from "../../../config/paths";
import { getBatchesQueryOptions, useBatches, type BatchFilters } from "../../../features/batches/api/get-batches";
import { BatchTable } from "../../../features/batches/components/batch-table";
import { getLayoutQueryOptions, useLayout } from "../../../features/layout/api/get-layout";
import { ALLOWED, Authorized } from "../../../lib/authorization";

const STATUSES = [
  { value: "open", label: "Open" },
  { value: "closed", label: "Closed" },
  { value: "all", label: "All" },
] as const;

function filtersFrom(search: URLSearchParams): BatchFilters {
  const status = search.get("status");
  const zone = Number(search.get("zone"));
  const variety = search.get("variety")?.trim();
  return {
    status: status === "closed" || status === "all" ? status : "open",
    ...(Number.isSafeInteger(zone) && zone > 0 ? { zoneId: zone } : {}),
    ...(variety ? { variety } : {}),
  };
}

export const clientLoader =
  (queryClient: QueryClient): LoaderFunction =>
  async ({ request }) => {
    const filters = filtersFrom(new URL(request.url).searchParams);
    await Promise.all([queryClient.ensureQueryData(getBatchesQueryOptions(filters)), queryClient.ensureQueryData(getLayoutQueryOptions())]);
    return null;
  };

/** `/batches`: batches of cuttings, filtered by status, zone and variety; new batch for those who record. */
export default function BatchesRoute() {
  const [search, setSearch] = useSearchParams();
  const filters = filtersFrom(search);
  const { data } = useBatches(filters);
  const { data: layout } = useLayout();
  const [variety, setVariety] = useState(filters.variety ?? "");
  const zones = layout.zones.filter((z) => z.archivedAtMs === null);

  const go = (next: BatchFilters) => setSearch(new URL(paths.batches.to(next), window.location.origin).searchParams, { replace: true });
  const onVariety = (event: FormEvent<HTMLFormElement>) => {
    event.preventDefault();
    go({ ...filters, variety: variety.trim() || undefined });
  };

  return (
    <div className="flex flex-col gap-5">
      <title>Batches · Benchwarden</title>
      <div className="flex flex-wrap items-center justify-between gap-3">
        <h1 className="text-3xl font-bold">Batches</h1>
        <Authorized roles={ALLOWED.recordWork}>
          <LinkButton to={paths.newBatch.to()} variant="primary" className="min-h-14">
            + New batch
          </LinkButton>
        </Authorized>
      </div>
      <div className="flex flex-wrap items-end gap-4">
        <div className="flex flex-col gap-1">
          <span className="text-lg font-semibold">Show</span>
          <SegmentedControl label="Which batches" value={filters.status} options={STATUSES} onChange={(status) => go({ ...filters, status })} />
        </div>
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
        <form onSubmit={onVariety} role="search" aria-label="Variety" className="flex items-end gap-2">
          <TextField label="Variety" value={variety} onChange={(e) => setVariety(e.target.value)} placeholder="Whole name" />
          <Button type="submit">Find</Button>
        </form>
      </div>
      <p className="text-base text-muted" role="status">
        {data.batches.length === 1 ? "1 batch" : `${data.batches.length} batches`}
      </p>
      <BatchTable batches={data.batches} batchHref={paths.batch.to} />
    </div>
  );
}

export const ErrorBoundary = RouteError;
