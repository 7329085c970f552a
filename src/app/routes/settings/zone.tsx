import type { QueryClient } from "@tanstack/react-query";
import { data, useParams, type LoaderFunction, type Params } from "react-router-dom";
import { PanelBoundary } from "../../../components/errors/panel-boundary";
import { RouteError } from "../../../components/errors/route-error";
import { LinkButton } from "../../../components/ui/link-button";
import { paths } from "../../../config/paths";
import { getZoneAuditQueryOptions } from "../../../features/audit/api/get-zone-audit";
import { ZoneAudit } from "../../../features/audit/components/audit-list";
import { getLayoutQueryOptions } from "../../../features/layout/api/get-layout";
import { BenchOrderList } from "../../../features/layout/components/bench-order-list";
import { ZoneControls } from "../../../features/layout/components/item-controls";
import { getWindowPresetsQueryOptions } from "../../../features/windows/api/get-window-presets";
import { getZoneWindowsQueryOptions, useZoneWindows } from "../../../features/windows/api/get-zone-windows";
import { PresetApply } from "../../../features/windows/components/preset-apply";
import { ZoneWindowEditor } from "../../../features/windows/components/zone-window-editor";
import { ALLOWED, Authorized } from "../../../lib/authorization";
import { SettingsHeader } from "./settings-header";

function parseZoneId(params: Params): number {
  const zoneId = Number(params.zoneId);
  if (!Number.isSafeInteger(zoneId) || zoneId <= 0) throw data("There is no zone with that number.", { status: 404, statusText: "Not found" });
  return zoneId;
}

export const clientLoader =
  (queryClient: QueryClient): LoaderFunction =>
  async ({ params }) => {
    const zoneId = parseZoneId(params);
    await Promise.all([
      queryClient.ensureQueryData(getZoneWindowsQueryOptions(zoneId)),
      queryClient.ensureQueryData(getLayoutQueryOptions({ includeArchived: true })),
      queryClient.ensureQueryData(getWindowPresetsQueryOptions()),
      queryClient.ensureInfiniteQueryData(getZoneAuditQueryOptions(zoneId)),
    ]);
    return null;
  };

/** `/settings/zones/:zoneId`: the zone's rooting window, presets, its benches in walking order, and its changes. */
export default function ZoneSettingsRoute() {
  const zoneId = parseZoneId(useParams());
  const { data: windows } = useZoneWindows(zoneId);
  const zone = windows.zone;
  return (
    <>
      <title>{`${zone.name} · Settings · Benchwarden`}</title>
      <SettingsHeader title={zone.name} lead={`${zone.siteName}${zone.archived ? " · archived" : ""}`}>
        <div className="flex flex-wrap gap-2">
          <LinkButton to={paths.zoneHistory.to(zone.id)}>
            Zone history
          </LinkButton>
          <PanelBoundary>
            <ZoneControls zoneId={zone.id} />
          </PanelBoundary>
        </div>
      </SettingsHeader>
      <div className="flex flex-col gap-10">
        <section aria-labelledby="zone-window-heading" className="flex flex-col gap-3">
          <h2 id="zone-window-heading" className="text-2xl font-bold">
            Rooting window
          </h2>
          <ZoneWindowEditor data={windows} />
        </section>
        {!zone.archived && (
          <Authorized roles={ALLOWED.manageGrowing}>
            <section aria-labelledby="zone-preset-heading" className="flex flex-col gap-3">
              <h2 id="zone-preset-heading" className="text-2xl font-bold">
                Apply a preset
              </h2>
              <p className="text-lg text-muted">Replaces the zone&apos;s windows and margin with the preset&apos;s. You see the values and any warnings before anything changes.</p>
              <PanelBoundary>
                <PresetApply target={{ kind: "zone", zoneId: zone.id, name: zone.name, benchOverrideCount: windows.benchOverrides.length }} />
              </PanelBoundary>
            </section>
          </Authorized>
        )}
        <section aria-labelledby="zone-benches-heading" className="flex flex-col gap-3">
          <h2 id="zone-benches-heading" className="text-2xl font-bold">
            Benches in walking order
          </h2>
          <PanelBoundary>
            <BenchOrderList zoneId={zone.id} />
          </PanelBoundary>
        </section>
        <section aria-labelledby="zone-audit-heading" className="flex flex-col gap-3">
          <h2 id="zone-audit-heading" className="text-2xl font-bold">
            Changes in this zone
          </h2>
          <PanelBoundary>
            <ZoneAudit zoneId={zone.id} />
          </PanelBoundary>
        </section>
      </div>
    </>
  );
}

export const ErrorBoundary = RouteError;
