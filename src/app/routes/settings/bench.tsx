import type { QueryClient } from "@tanstack/react-query";
import { Suspense } from "react";
import { data, useParams, type LoaderFunction, type Params } from "react-router-dom";
import { PanelBoundary } from "../../../components/errors/panel-boundary";
import { RouteError } from "../../../components/errors/route-error";
import { LinkButton } from "../../../components/ui/link-button";
import { Loading } from "../../../components/ui/loading";
import { paths } from "../../../config/paths";
import { AuditLogEntries } from "../../../features/audit/components/audit-list";
import { getLayoutQueryOptions } from "../../../features/layout/api/get-layout";
import { BenchAssignments } from "../../../features/layout/components/bench-assignments";
import { BenchControls } from "../../../features/layout/components/item-controls";
import { getBenchWindowsQueryOptions, useBenchWindows } from "../../../features/windows/api/get-bench-windows";
import { getWindowPresetsQueryOptions } from "../../../features/windows/api/get-window-presets";
import { BenchWindowEditor } from "../../../features/windows/components/bench-window-editor";
import { PresetApply } from "../../../features/windows/components/preset-apply";
import { ALLOWED, Authorized } from "../../../lib/authorization";
import { SettingsHeader } from "./settings-header";

function parseBenchId(params: Params): number {
  const benchId = Number(params.benchId);
  if (!Number.isSafeInteger(benchId) || benchId <= 0) throw data("There is no bench with that number.", { status: 404, statusText: "Not found" });
  return benchId;
}

export const clientLoader =
  (queryClient: QueryClient): LoaderFunction =>
  async ({ params }) => {
    const benchId = parseBenchId(params);
    await Promise.all([
      queryClient.ensureQueryData(getBenchWindowsQueryOptions(benchId)),
      queryClient.ensureQueryData(getLayoutQueryOptions({ includeArchived: true })),
      queryClient.ensureQueryData(getWindowPresetsQueryOptions()),
    ]);
    return null;
  };

/** `/settings/benches/:benchId`: where the bench's windows differ from its zone's, and its changes. */
export default function BenchSettingsRoute() {
  const benchId = parseBenchId(useParams());
  const { data: windows } = useBenchWindows(benchId);
  const bench = windows.bench;
  return (
    <>
      <title>{`${bench.name} · ${bench.zoneName} · Settings · Benchwarden`}</title>
      <SettingsHeader title={bench.name} lead={`${bench.zoneName}${bench.archived ? " · archived" : ""}`}>
        <div className="flex flex-wrap gap-2">
          <LinkButton to={paths.settingsZone.to(bench.zoneId)}>
            <span aria-hidden="true">←</span> {bench.zoneName}
          </LinkButton>
          <LinkButton to={paths.bench.to(bench.id)}>
            Bench history
          </LinkButton>
          <PanelBoundary>
            <BenchControls benchId={bench.id} />
          </PanelBoundary>
        </div>
      </SettingsHeader>
      <div className="flex flex-col gap-10">
        <section aria-labelledby="bench-window-heading" className="flex flex-col gap-3">
          <h2 id="bench-window-heading" className="text-2xl font-bold">
            Windows on this bench
          </h2>
          <BenchWindowEditor data={windows} />
        </section>
        {!bench.archived && (
          <Authorized roles={ALLOWED.manageGrowing}>
            <section aria-labelledby="bench-preset-heading" className="flex flex-col gap-3">
              <h2 id="bench-preset-heading" className="text-2xl font-bold">
                Apply a preset to this bench only
              </h2>
              <p className="text-lg text-muted">The preset&apos;s windows and margin become this bench&apos;s own; the zone is not changed.</p>
              <PanelBoundary>
                <PresetApply target={{ kind: "bench", benchId: bench.id, name: bench.name }} />
              </PanelBoundary>
            </section>
          </Authorized>
        )}
        <section aria-labelledby="bench-sensors-heading" className="flex flex-col gap-3">
          <h2 id="bench-sensors-heading" className="text-2xl font-bold">
            Sensors on this bench
          </h2>
          <PanelBoundary>
            <Suspense fallback={<Loading label="Loading sensors…" />}>
              <BenchAssignments benchId={bench.id} />
            </Suspense>
          </PanelBoundary>
        </section>
        <section aria-labelledby="bench-audit-heading" className="flex flex-col gap-3">
          <h2 id="bench-audit-heading" className="text-2xl font-bold">
            Changes to this bench
          </h2>
          <PanelBoundary>
            <Suspense fallback={<Loading label="Loading changes…" />}>
              <AuditLogEntries filters={{ benchId: bench.id }} emptyText="Nothing about this bench has been changed yet." />
            </Suspense>
          </PanelBoundary>
        </section>
      </div>
    </>
  );
}

export const ErrorBoundary = RouteError;
