import { Link } from "react-router-dom";
import type { TemperatureUnit } from "../../../../shared/domain/units.js";
import { WINDOWED_QUANTITIES } from "../../../../shared/schemas/quantities.js";
import type { BenchSummary } from "../../../../shared/schemas/zones.js";
import { StatusPill } from "../../../components/ui/status-pill";
import { paths } from "../../../config/paths";
import { formatDuration, isStale } from "../../../lib/format-time";
import { describeBenchStatus, findLatest } from "../utils/describe-bench";
import { BenchAlerts } from "./bench-alerts";
import { QuantityTile } from "./quantity-tile";

type BenchCardProps = { bench: BenchSummary; unit: TemperatureUnit; nowMs: number };

const CARD_BORDER = {
  inside: "border-line",
  below: "border-low",
  above: "border-high",
  unknown: "border-line",
} as const;

/** A bench on the dashboard: its overall status and the four windowed quantities. The whole card opens the bench. */
export function BenchCard({ bench, unit, nowMs }: BenchCardProps) {
  const alerts = bench.alerts ?? [];
  // A raised alert (nobody has taken it yet) marks the card as loudly as a value out of window.
  const isValueOut = bench.status === "below" || bench.status === "above";
  const hasRaised = alerts.some((a) => a.phase === "raised");
  const isOut = isValueOut || hasRaised;
  const newestMs = bench.latest.length > 0 ? Math.max(...bench.latest.map((l) => l.timeMs)) : null;
  // Every value is old: say so at the top, so "All in window" is not read as current news.
  const isQuiet = newestMs !== null && isStale(newestMs, nowMs);
  return (
    <article
      aria-labelledby={`bench-${bench.id}-name`}
      data-bench-id={bench.id}
      data-status={bench.status}
      data-open-alerts={alerts.length || undefined}
      className={`relative flex flex-col gap-3 rounded-2xl bg-surface p-3 shadow-sm transition-shadow focus-within:shadow-md hover:shadow-md sm:p-4 ${
        isOut ? "border-4" : "border-2"
      } ${hasRaised && !isValueOut ? "border-high" : CARD_BORDER[bench.status]}`}
    >
      <header className="flex flex-wrap items-center justify-between gap-2">
        <h3 id={`bench-${bench.id}-name`} className="text-2xl font-bold leading-tight">
          {/* The link's box covers the card (after:inset-0), so the whole card is one big touch target. */}
          <Link
            to={paths.bench.to(bench.id)}
            className="inline-flex min-h-touch items-center after:absolute after:inset-0 after:rounded-2xl after:content-['']"
          >
            {bench.name}
            <span className="sr-only">, open 24-hour chart</span>
          </Link>
        </h3>
        <StatusPill status={bench.status} label={describeBenchStatus(bench)} />
      </header>
      <BenchAlerts alerts={alerts} unit={unit} benchName={bench.name} />
      {isQuiet && (
        <p className="-mt-1 text-base font-bold text-muted">No new readings for {formatDuration(nowMs - newestMs)}</p>
      )}
      <div className="grid grid-cols-2 gap-2">
        {WINDOWED_QUANTITIES.map((quantity) => (
          <QuantityTile
            key={quantity}
            quantity={quantity}
            reading={findLatest(bench, quantity)}
            window={bench.windows.find((w) => w.quantity === quantity)}
            unit={unit}
            nowMs={nowMs}
          />
        ))}
      </div>
    </article>
  );
}
