import type { QueryClient } from "@tanstack/react-query";
import { useQuery } from "@tanstack/react-query";
import type { LoaderFunction } from "react-router-dom";
import type { Role } from "../../../../shared/schemas/auth.js";
import { PanelBoundary } from "../../../components/errors/panel-boundary";
import { RouteError } from "../../../components/errors/route-error";
import { getSessionQueryOptions } from "../../../features/auth/api/get-session";
import { getDutyRotaQueryOptions } from "../../../features/rota/api/get-duty-rota";
import { AlertTiming } from "../../../features/rota/components/alert-timing";
import { DutyRota } from "../../../features/rota/components/duty-rota";
import { getDutyCandidatesQueryOptions } from "../../../features/rota/api/get-duty-candidates";
import { useNow } from "../../../hooks/use-now";
import { ALLOWED, useAuthorization } from "../../../lib/authorization";

export const clientLoader =
  (queryClient: QueryClient): LoaderFunction =>
  async () => {
    const session = await queryClient.ensureQueryData(getSessionQueryOptions());
    await Promise.all([
      queryClient.ensureQueryData(getDutyRotaQueryOptions()),
      // Those who edit the rota get the list of everyone who can acknowledge, for the picker.
      (ALLOWED.manageGrowing as readonly Role[]).includes(session.user.role) ? queryClient.prefetchQuery(getDutyCandidatesQueryOptions()) : null,
    ]);
    return null;
  };

/**
 * `/duty-rota`: who is told about alerts, per zone, by day and hour, and per site when the managers
 * are told and how often the person on duty is reminded. Admins and managers edit it.
 */
export default function DutyRotaRoute() {
  const { isAllowed } = useAuthorization();
  const canEdit = isAllowed(ALLOWED.manageGrowing);
  // The server lists active admins, managers and growers: viewers cannot acknowledge, so cannot be on duty.
  const candidates = useQuery({ ...getDutyCandidatesQueryOptions(), enabled: canEdit });
  const people = candidates.data?.users.map((u) => ({ id: u.id, name: u.name }));
  const nowMs = useNow(60_000);
  return (
    <div className="flex flex-col gap-6">
      <title>Duty rota · Benchwarden</title>
      <div>
        <h1 className="text-3xl font-bold">Duty rota</h1>
        <p className="mt-1 max-w-3xl text-lg text-muted">
          Who gets the alert e-mails for each zone, by day and hour. When nobody's shift covers a time, the fallback shifts' people are told;
          with no fallback either, the managers.
        </p>
      </div>
      <PanelBoundary>
        <DutyRota people={people} nowMs={nowMs} />
      </PanelBoundary>
      <PanelBoundary>
        <AlertTiming />
      </PanelBoundary>
    </div>
  );
}

export const ErrorBoundary = RouteError;
