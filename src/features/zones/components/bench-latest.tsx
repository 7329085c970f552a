import type { TemperatureUnit } from "../../../../shared/domain/units.js";
import { WINDOWED_QUANTITIES } from "../../../../shared/schemas/quantities.js";
import { StatusPill } from "../../../components/ui/status-pill";
import { useZones } from "../api/get-zones";
import { describeBenchStatus, findLatest } from "../utils/describe-bench";
import { QuantityTile } from "./quantity-tile";

type BenchLatestProps = { benchId: number; unit: TemperatureUnit; nowMs: number };

/** The bench page's latest values, read from the live zones list so they move with the stream. */
export function BenchLatest({ benchId, unit, nowMs }: BenchLatestProps) {
  const { data } = useZones();
  const bench = data.zones.flatMap((z) => z.benches).find((b) => b.id === benchId);
  if (!bench) {
    return <p className="text-lg text-muted">This bench is not on the dashboard list; no latest values to show.</p>;
  }
  return (
    <section aria-labelledby="latest-heading">
      <div className="mb-3 flex flex-wrap items-center gap-3">
        <h2 id="latest-heading" className="text-xl font-bold">
          Latest readings
        </h2>
        <StatusPill status={bench.status} label={describeBenchStatus(bench)} />
      </div>
      <div className="grid grid-cols-2 gap-3 lg:grid-cols-4">
        {WINDOWED_QUANTITIES.map((quantity) => (
          <QuantityTile
            key={quantity}
            quantity={quantity}
            reading={findLatest(bench, quantity)}
            window={bench.windows.find((w) => w.quantity === quantity)}
            unit={unit}
            nowMs={nowMs}
            size="large"
          />
        ))}
      </div>
    </section>
  );
}
