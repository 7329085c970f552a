import type { QueryClient } from "@tanstack/react-query";
import type { LoaderFunction } from "react-router-dom";
import { RouteError } from "../../components/errors/route-error";
import { getZonesQueryOptions, useZones } from "../../features/zones/api/get-zones";
import { OutOfWindowSummary } from "../../features/zones/components/out-of-window-summary";
import { ZoneSection } from "../../features/zones/components/zone-section";
import { useNow } from "../../hooks/use-now";
import { useTemperatureUnit } from "../../lib/temperature-unit";

export const clientLoader =
  (queryClient: QueryClient): LoaderFunction =>
  async () => {
    await queryClient.ensureQueryData(getZonesQueryOptions());
    return null;
  };

/** `/`: every zone (with its site) and its bench cards, out-of-window benches listed first. */
export default function DashboardRoute() {
  const { data } = useZones();
  const { unit } = useTemperatureUnit();
  const nowMs = useNow();
  const outCount = data.zones.flatMap((z) => z.benches).filter((b) => b.status === "below" || b.status === "above").length;

  return (
    <>
      <title>{outCount > 0 ? `(${outCount} out) Benchwarden` : "Benchwarden"}</title>
      <h1 className="sr-only">Benches</h1>
      <div className="mb-6">
        <OutOfWindowSummary zones={data.zones} />
      </div>
      {data.zones.map((zone) => (
        <ZoneSection key={zone.id} zone={zone} unit={unit} nowMs={nowMs} />
      ))}
    </>
  );
}

export const ErrorBoundary = RouteError;
