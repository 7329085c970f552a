import { Link } from "react-router-dom";
import type { ZoneSummary } from "../../../../shared/schemas/zones.js";
import { StatusIcon } from "../../../components/ui/status-icon";
import { paths } from "../../../config/paths";
import { isOutOfWindow } from "../../../lib/quantity-labels";
import { listProblems } from "../utils/describe-bench";

/**
 * The first thing on the dashboard: either a calm "all in window" line or, when something is
 * wrong, a list of exactly which benches and what, each a link to the bench.
 */
export function OutOfWindowSummary({ zones }: { zones: readonly ZoneSummary[] }) {
  const benches = zones.flatMap((zone) => zone.benches.map((bench) => ({ zone, bench })));
  const out = benches.filter(({ bench }) => isOutOfWindow(bench.status));
  const withoutReadings = benches.filter(({ bench }) => bench.latest.length === 0).length;

  if (benches.length === 0) {
    return <p className="rounded-xl border-2 border-line bg-surface p-4 text-lg">No benches are set up yet.</p>;
  }

  if (out.length === 0) {
    return (
      <p
        data-status="inside"
        className="flex items-center gap-2 rounded-xl border-2 border-line bg-ok-soft p-4 text-xl font-bold text-ok"
      >
        <StatusIcon status="inside" className="size-7" />
        {benches.length === 1 ? "The bench is in window" : `All ${benches.length} benches in window`}
        {withoutReadings > 0 && (
          <span className="font-semibold text-muted">
            {" "}
            ({withoutReadings} without readings)
          </span>
        )}
      </p>
    );
  }

  return (
    <section
      aria-labelledby="out-of-window-heading"
      data-status="out"
      className="rounded-xl border-4 border-high bg-high-soft p-4"
    >
      <h2 id="out-of-window-heading" className="flex items-center gap-2 text-2xl font-bold">
        <WarningMark />
        {out.length === 1 ? "1 bench out of window" : `${out.length} of ${benches.length} benches out of window`}
      </h2>
      <ul className="mt-3 flex flex-col gap-2">
        {out.map(({ zone, bench }) => (
          <li key={bench.id}>
            <Link
              to={paths.bench.to(bench.id)}
              className="flex min-h-touch flex-wrap items-center gap-x-3 gap-y-1 rounded-lg bg-surface px-3 py-2 text-lg hover:ring-2 hover:ring-accent"
            >
              <span className="font-bold">{bench.name}</span>
              <span className="text-muted">{zone.name}</span>
              <span className="flex flex-wrap gap-2">
                {listProblems(bench).map((problem) => (
                  <span
                    key={problem.quantity}
                    className={`inline-flex items-center gap-1 rounded-full px-2.5 py-0.5 font-bold text-on-status ${
                      problem.status === "below" ? "bg-low" : "bg-high"
                    }`}
                  >
                    <StatusIcon status={problem.status} className="size-5" />
                    {problem.label}
                  </span>
                ))}
              </span>
            </Link>
          </li>
        ))}
      </ul>
    </section>
  );
}

function WarningMark() {
  return (
    <svg viewBox="0 0 24 24" className="size-7 shrink-0 text-high" aria-hidden="true" focusable="false">
      <path d="M12 2.5 1.5 21h21L12 2.5Z" fill="currentColor" />
      <path d="M12 9v5.5" stroke="white" strokeWidth="2.5" strokeLinecap="round" />
      <circle cx="12" cy="17.6" r="1.4" fill="white" />
    </svg>
  );
}
