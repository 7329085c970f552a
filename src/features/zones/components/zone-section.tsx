import type { TemperatureUnit } from "../../../../shared/domain/units.js";
import type { ZoneSummary } from "../../../../shared/schemas/zones.js";
import { BenchCard } from "./bench-card";

type ZoneSectionProps = { zone: ZoneSummary; unit: TemperatureUnit; nowMs: number };

export function ZoneSection({ zone, unit, nowMs }: ZoneSectionProps) {
  const benches = [...zone.benches].sort((a, b) => a.position - b.position || a.name.localeCompare(b.name));
  const outCount = benches.filter((b) => b.status === "below" || b.status === "above").length;
  return (
    <section aria-labelledby={`zone-${zone.id}-name`} className="mt-8 first:mt-0">
      <header className="mb-3 flex flex-wrap items-baseline gap-x-3 gap-y-1 border-b-2 border-line pb-2">
        <h2 id={`zone-${zone.id}-name`} className="text-2xl font-bold sm:text-3xl">
          {zone.name}
        </h2>
        <span className="text-lg text-muted">{zone.siteName}</span>
        <span className="ml-auto text-lg font-semibold text-muted">
          {benches.length === 1 ? "1 bench" : `${benches.length} benches`}
          {outCount > 0 && `, ${outCount} out of window`}
        </span>
      </header>
      {benches.length === 0 ? (
        <p className="text-lg text-muted">No benches in this zone yet.</p>
      ) : (
        <div className="grid grid-cols-1 gap-4 md:grid-cols-2 xl:grid-cols-3">
          {benches.map((bench) => (
            <BenchCard key={bench.id} bench={bench} unit={unit} nowMs={nowMs} />
          ))}
        </div>
      )}
    </section>
  );
}
