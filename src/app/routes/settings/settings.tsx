import type { QueryClient } from "@tanstack/react-query";
import type { LoaderFunction } from "react-router-dom";
import { PanelBoundary } from "../../../components/errors/panel-boundary";
import { RouteError } from "../../../components/errors/route-error";
import { Notice } from "../../../components/ui/notice";
import { getLayoutQueryOptions } from "../../../features/layout/api/get-layout";
import { LayoutOverview } from "../../../features/layout/components/layout-overview";
import { SafetyCautions } from "../../../features/settings/components/safety-cautions";
import { getWindowPresetsQueryOptions, useWindowPresets } from "../../../features/windows/api/get-window-presets";
import { ALLOWED, useAuthorization } from "../../../lib/authorization";
import { SettingsHeader } from "./settings-header";

export const clientLoader =
  (queryClient: QueryClient): LoaderFunction =>
  async () => {
    await Promise.all([queryClient.ensureQueryData(getLayoutQueryOptions()), queryClient.ensureQueryData(getWindowPresetsQueryOptions())]);
    return null;
  };

/** `/settings`: the cautions, then the nursery's sites and zones (each zone opens its windows, benches and changes). */
export default function SettingsRoute() {
  const { data: presets } = useWindowPresets();
  const { isAllowed } = useAuthorization();
  return (
    <>
      <title>Settings · Benchwarden</title>
      <SettingsHeader title="Settings" lead="Sites, zones and benches, each zone's rooting window, presets, and every change made to them." />
      <div className="flex flex-col gap-8">
        <SafetyCautions />
        {!isAllowed(ALLOWED.manageGrowing) && (
          <Notice tone="info" title="Read only">
            You can read every setting here; a manager or an admin changes them.
          </Notice>
        )}
        <section aria-labelledby="layout-heading" className="flex flex-col gap-3">
          <h2 id="layout-heading" className="text-2xl font-bold">
            Sites, zones and benches
          </h2>
          <PanelBoundary>
            <LayoutOverview presetChoices={presets.presets.map((p) => ({ id: p.id, name: p.name }))} />
          </PanelBoundary>
        </section>
      </div>
    </>
  );
}

export const ErrorBoundary = RouteError;
