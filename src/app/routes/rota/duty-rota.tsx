import type { QueryClient } from "@tanstack/react-query";
import { useQuery } from "@tanstack/react-query";
import type { LoaderFunction } from "react-router-dom";
import type { Role } from "../../../../shared/schemas/auth.js";
import { PanelBoundary } from "../../../components/errors/panel-boundary";
import { RouteError } from "../../../components/errors/route-error";
import { getSessionQueryOptions } from "../../../features/auth/api/get-session";
import { getDutyRotaQueryOptions } from "../../../features/rota/api/get-duty-rota";
import { DutyRota } from "../../../features/rota/components/duty-rota";
import { getUsersQueryOptions } from "../../../features/users/api/get-users";
import { useNow } from "../../../hooks/use-now";
import { ALLOWED, useAuthorization } from "../../../lib/authorization";

export const clientLoader =
  (queryClient: QueryClient): LoaderFunction =>
  async () => {
    const session = await queryClient.ensureQueryData(getSessionQueryOptions());
    await Promise.all([
      queryClient.ensureQueryData(getDutyRotaQueryOptions()),
      // Only an admin may list the users; for them the picker offers everyone who can acknowledge.
      (ALLOWED.manageUsers as readonly Role[]).includes(session.user.role) ? queryClient.prefetchQuery(getUsersQueryOptions()) : null,
    ]);
    return null;
  };

/** `/duty-rota`: who is told about alerts, per zone, by day and hour. Admins and managers edit it. */
export default function DutyRotaRoute() {
  const { isAllowed } = useAuthorization();
  const isAdmin = isAllowed(ALLOWED.manageUsers);
  const users = useQuery({ ...getUsersQueryOptions(), enabled: isAdmin });
  // Viewers cannot acknowledge, so cannot be on duty; disabled accounts are not offered either.
  const people = isAdmin && users.data ? users.data.users.filter((u) => u.role !== "viewer" && !u.disabled).map((u) => ({ id: u.id, name: u.name })) : undefined;
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
    </div>
  );
}

export const ErrorBoundary = RouteError;
