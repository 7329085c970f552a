import type { QueryClient } from "@tanstack/react-query";
import { useState } from "react";
import { Link, useNavigate, type LoaderFunction } from "react-router-dom";
import { RouteError } from "../../../components/errors/route-error";
import { Notice } from "../../../components/ui/notice";
import { useToast } from "../../../components/ui/toast";
import { paths } from "../../../config/paths";
import { getLayoutQueryOptions, useLayout } from "../../../features/layout/api/get-layout";
import { getRoundsQueryOptions, useRounds } from "../../../features/rounds/api/get-rounds";
import { useStartRound } from "../../../features/rounds/api/start-round";
import { StartRoundPanel, type RoundScope } from "../../../features/rounds/components/start-round-panel";
import { formatSiteDateTime } from "../../../features/rounds/utils/round-words";
import { ALLOWED, useAuthorization } from "../../../lib/authorization";

const IN_PROGRESS = { status: "in-progress", limit: 20 } as const;
const FINISHED = { status: "finished", limit: 8 } as const;

export const clientLoader =
  (queryClient: QueryClient): LoaderFunction =>
  async () => {
    await Promise.all([
      queryClient.ensureQueryData(getLayoutQueryOptions()),
      queryClient.ensureQueryData(getRoundsQueryOptions(IN_PROGRESS)),
      queryClient.ensureQueryData(getRoundsQueryOptions(FINISHED)),
    ]);
    return null;
  };

/** `/rounds`: start the morning walk-through of a zone or of every zone, or resume one in progress. */
export default function RoundsRoute() {
  const { data: layout } = useLayout();
  const { data: inProgress } = useRounds(IN_PROGRESS);
  const { data: finished } = useRounds(FINISHED);
  const { isAllowed } = useAuthorization();
  const start = useStartRound();
  const navigate = useNavigate();
  const { showToast } = useToast();
  const [busyKey, setBusyKey] = useState<string | null>(null);
  const [refusal, setRefusal] = useState<string | null>(null);

  const benchCount = (zoneId: number) => layout.benches.filter((b) => b.zoneId === zoneId && b.archivedAtMs === null).length;
  const sites = layout.sites.filter((s) => s.archivedAtMs === null);
  const scopes: RoundScope[] = sites.flatMap((site) => {
    const zones = layout.zones.filter((z) => z.siteId === site.id && z.archivedAtMs === null);
    const all = zones.reduce((n, z) => n + benchCount(z.id), 0);
    return [
      ...zones.map((zone) => ({ key: `zone-${zone.id}`, label: zone.name, detail: `${benchCount(zone.id)} benches`, input: { zoneId: zone.id } })),
      { key: `site-${site.id}`, label: sites.length > 1 ? `every zone of ${site.name}` : "every zone", detail: `${zones.length} zones, ${all} benches`, input: { siteId: site.id } },
    ];
  });

  function onStart(scope: RoundScope) {
    setBusyKey(scope.key);
    setRefusal(null);
    start.mutate(scope.input, {
      onSuccess: ({ round, resumed }) => {
        if (resumed) showToast(`Joined the round ${round.startedBy.name} started ${formatSiteDateTime(round.startedAtMs, round.timeZone)}`, "info");
        void navigate(paths.round.to(round.id));
      },
      onError: (error) => setRefusal(error.message),
      onSettled: () => setBusyKey(null),
    });
  }

  return (
    <div className="mx-auto flex max-w-4xl flex-col gap-6">
      <title>Walk-through · Benchwarden</title>
      <h1 className="text-3xl font-bold">Morning walk-through</h1>
      {refusal && (
        <Notice tone="error" title="That round could not start">
          {refusal}
        </Notice>
      )}
      <StartRoundPanel
        scopes={scopes}
        inProgress={inProgress.rounds}
        roundHref={paths.round.to}
        onStart={isAllowed(ALLOWED.recordWork) ? onStart : null}
        busyKey={busyKey}
      />
      {finished.rounds.length > 0 && (
        <section aria-labelledby="rounds-finished">
          <h2 id="rounds-finished" className="text-2xl font-bold">
            Recent rounds
          </h2>
          <ul className="mt-2 flex flex-col gap-2">
            {finished.rounds.map((round) => (
              <li key={round.id}>
                <Link to={paths.round.to(round.id)} className="flex min-h-touch flex-wrap items-baseline justify-between gap-x-4 rounded-xl border-2 border-line bg-surface px-4 py-2 text-lg">
                  <span className="font-bold underline underline-offset-4">{round.scopeLabel}</span>
                  <span className="text-base">
                    {round.finishedAtMs ? formatSiteDateTime(round.finishedAtMs, round.timeZone) : ""} · {round.checkedCount} of {round.benchCount} checked · {round.finishedBy?.name ?? round.startedBy.name}
                  </span>
                </Link>
              </li>
            ))}
          </ul>
        </section>
      )}
    </div>
  );
}

export const ErrorBoundary = RouteError;
