import type { RoundView } from "../../../../shared/schemas/rounds.js";
import { Button } from "../../../components/ui/button";
import { LinkButton } from "../../../components/ui/link-button";
import { formatSiteDateTime } from "../utils/round-words";

export type RoundScope = { key: string; label: string; detail: string; input: { zoneId?: number; siteId?: number } };

type StartRoundPanelProps = {
  scopes: readonly RoundScope[];
  inProgress: readonly RoundView[];
  roundHref: (roundId: number) => string;
  /** Null for those who may not walk (viewers). */
  onStart: ((scope: RoundScope) => void) | null;
  busyKey: string | null;
};

/** Start a walk-through of one zone or of every zone, or carry on with one in progress. */
export function StartRoundPanel({ scopes, inProgress, roundHref, onStart, busyKey }: StartRoundPanelProps) {
  return (
    <div className="flex flex-col gap-6">
      {inProgress.length > 0 && (
        <section aria-labelledby="rounds-in-progress" className="rounded-2xl border-2 border-accent bg-surface p-4">
          <h2 id="rounds-in-progress" className="text-2xl font-bold">
            In progress
          </h2>
          <ul className="mt-2 flex flex-col gap-3">
            {inProgress.map((round) => (
              <li key={round.id} className="flex flex-wrap items-center justify-between gap-3">
                <div>
                  <p className="text-xl font-bold">{round.scopeLabel}</p>
                  <p className="text-base">
                    Started {formatSiteDateTime(round.startedAtMs, round.timeZone)} by {round.startedBy.name} · {round.checkedCount} of {round.benchCount} benches checked
                  </p>
                </div>
                <LinkButton to={roundHref(round.id)} variant="primary" className="min-h-14">
                  Resume<span className="sr-only"> {round.scopeLabel}</span>
                </LinkButton>
              </li>
            ))}
          </ul>
        </section>
      )}

      {onStart && (
        <section aria-labelledby="rounds-start">
          <h2 id="rounds-start" className="text-2xl font-bold">
            Start a walk-through
          </h2>
          <p className="text-lg text-muted">Benches come in walking order. A zone someone is already walking is joined, not started twice.</p>
          <ul className="mt-3 grid gap-3 sm:grid-cols-2">
            {scopes.map((scope) => (
              <li key={scope.key}>
                <Button onClick={() => onStart(scope)} isBusy={busyKey === scope.key} disabled={busyKey !== null} className="min-h-20 w-full flex-col !items-start !gap-0 py-2 text-left">
                  <span className="text-xl font-bold">Walk {scope.label}</span>
                  <span className="text-base font-normal">{scope.detail}</span>
                </Button>
              </li>
            ))}
          </ul>
        </section>
      )}
    </div>
  );
}
