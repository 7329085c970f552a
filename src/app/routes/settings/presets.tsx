import type { QueryClient } from "@tanstack/react-query";
import type { LoaderFunction } from "react-router-dom";
import { RouteError } from "../../../components/errors/route-error";
import { getWindowPresetsQueryOptions } from "../../../features/windows/api/get-window-presets";
import { PresetsManager } from "../../../features/windows/components/presets-manager";
import { SettingsHeader } from "./settings-header";

export const clientLoader =
  (queryClient: QueryClient): LoaderFunction =>
  async () => {
    await queryClient.ensureQueryData(getWindowPresetsQueryOptions());
    return null;
  };

/** `/settings/presets`: named window sets to apply to a zone or a bench. */
export default function PresetsRoute() {
  return (
    <>
      <title>Window presets · Settings · Benchwarden</title>
      <SettingsHeader
        title="Window presets"
        lead="Named window sets for a crop or a stage. Applying one copies its values: changing a preset later does not change zones it was applied to."
      />
      <PresetsManager />
    </>
  );
}

export const ErrorBoundary = RouteError;
