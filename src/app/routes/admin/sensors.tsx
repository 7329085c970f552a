import { useQueryClient, useSuspenseQuery, type QueryClient } from "@tanstack/react-query";
import type { LoaderFunction } from "react-router-dom";
import type { ZoneSummary } from "../../../../shared/schemas/zones.js";
import { RouteError } from "../../../components/errors/route-error";
import { getSensorsQueryOptions } from "../../../features/sensors/api/get-sensors";
import { SensorsAdmin } from "../../../features/sensors/components/sensors-admin";
import type { BenchChoices } from "../../../features/sensors/utils/describe-sensor";
import { getZonesQueryOptions } from "../../../features/zones/api/get-zones";
import { ALLOWED } from "../../../lib/authorization";
import { requireRole } from "../../session-guard";

export const clientLoader =
  (queryClient: QueryClient): LoaderFunction =>
  async () => {
    await requireRole(queryClient, ALLOWED.manageSensors);
    await Promise.all([queryClient.ensureQueryData(getSensorsQueryOptions()), queryClient.ensureQueryData(getZonesQueryOptions())]);
    return null;
  };

/** Benches in walking order, grouped by zone; the site is named only when there is more than one. */
export function toBenchChoices(zones: readonly ZoneSummary[]): BenchChoices {
  const hasSeveralSites = new Set(zones.map((z) => z.siteId)).size > 1;
  return zones.map((zone) => ({
    zoneName: hasSeveralSites ? `${zone.siteName} · ${zone.name}` : zone.name,
    benches: [...zone.benches]
      .sort((a, b) => a.position - b.position || a.name.localeCompare(b.name))
      .map((bench) => ({ id: bench.id, name: bench.name })),
  }));
}

/** `/sensors` (admin): the probe fleet; register, new secret, disable, move. */
export default function SensorsRoute() {
  const queryClient = useQueryClient();
  const { data: zones } = useSuspenseQuery(getZonesQueryOptions());
  return (
    <div className="flex flex-col gap-6">
      <title>Sensors · Benchwarden</title>
      <div>
        <h1 className="text-3xl font-bold">Sensors</h1>
        <p className="mt-1 max-w-3xl text-lg text-muted">
          Each probe signs in to the MQTT broker with its id and its own secret, and may publish only its own readings.
        </p>
      </div>
      <SensorsAdmin
        benchChoices={toBenchChoices(zones.zones)}
        // Bench cards list their probes: refresh them after a move, a new probe or a disable.
        onChanged={() => void queryClient.invalidateQueries({ queryKey: getZonesQueryOptions().queryKey })}
      />
    </div>
  );
}

export const ErrorBoundary = RouteError;
