import type { QueryClient } from "@tanstack/react-query";
import type { LoaderFunction } from "react-router-dom";
import { RouteError } from "../../../components/errors/route-error";
import { getAuditQueryOptions } from "../../../features/audit/api/get-audit";
import { AuditLog } from "../../../features/audit/components/audit-list";
import { getLayoutQueryOptions, useLayout } from "../../../features/layout/api/get-layout";
import { SettingsHeader } from "./settings-header";

export const clientLoader =
  (queryClient: QueryClient): LoaderFunction =>
  async () => {
    await Promise.all([queryClient.ensureQueryData(getLayoutQueryOptions({ includeArchived: true })), queryClient.ensureInfiniteQueryData(getAuditQueryOptions({}))]);
    return null;
  };

/** `/settings/changes`: every change to the layout, windows, presets, sensor assignments and the rota. */
export default function ChangesRoute() {
  const { data: layout } = useLayout({ includeArchived: true });
  return (
    <>
      <title>Change log · Settings · Benchwarden</title>
      <SettingsHeader title="Change log" lead="Who changed what and when, old value → new, in your unit. Newest first." />
      <AuditLog zoneChoices={layout.zones.map((z) => ({ id: z.id, name: z.name }))} />
    </>
  );
}

export const ErrorBoundary = RouteError;
