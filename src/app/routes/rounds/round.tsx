import { useQuery, type QueryClient } from "@tanstack/react-query";
import { useState } from "react";
import { data, useParams, type LoaderFunction, type Params } from "react-router-dom";
import type { BenchCard, RoundView } from "../../../../shared/schemas/rounds.js";
import { PanelBoundary } from "../../../components/errors/panel-boundary";
import { RouteError } from "../../../components/errors/route-error";
import { Button } from "../../../components/ui/button";
import { ConfirmDialog } from "../../../components/ui/dialog";
import { LinkButton } from "../../../components/ui/link-button";
import { Notice } from "../../../components/ui/notice";
import { useToast } from "../../../components/ui/toast";
import { paths } from "../../../config/paths";
import { BatchOnBench } from "../../../features/batches/components/batch-on-bench";
import { ObservationLine } from "../../../features/batches/components/observation-line";
import { useIsOnline, useOfflineQueue, useWaitingEntries } from "../../../features/offline/hooks/offline-queue";
import { useAbandonRound } from "../../../features/rounds/api/abandon-round";
import { useCheckBench, usePendingChecks } from "../../../features/rounds/api/check-bench";
import { useFinishRound } from "../../../features/rounds/api/finish-round";
import { getRoundQueryOptions, useRound } from "../../../features/rounds/api/get-round";
import { getRoundCardsQueryOptions, useRoundCards } from "../../../features/rounds/api/get-round-cards";
import { getRoundSummaryQueryOptions, useRoundSummary } from "../../../features/rounds/api/get-round-summary";
import { useUncheckBench } from "../../../features/rounds/api/uncheck-bench";
import { BenchRoundCard, type CheckState } from "../../../features/rounds/components/bench-round-card";
import { RoundProgress } from "../../../features/rounds/components/round-progress";
import { RoundSummaryView } from "../../../features/rounds/components/round-summary";
import { formatSiteDateTime } from "../../../features/rounds/utils/round-words";
import { ALLOWED, useAuthorization } from "../../../lib/authorization";
import { useTemperatureUnit } from "../../../lib/temperature-unit";

function parseRoundId(params: Params): number {
  const roundId = Number(params.roundId);
  if (!Number.isSafeInteger(roundId) || roundId <= 0) throw data("There is no walk-through with that number.", { status: 404, statusText: "Not found" });
  return roundId;
}

export const clientLoader =
  (queryClient: QueryClient): LoaderFunction =>
  async ({ params }) => {
    const roundId = parseRoundId(params);
    const { round } = await queryClient.ensureQueryData(getRoundQueryOptions(roundId));
    if (round.status === "finished") await queryClient.ensureQueryData(getRoundSummaryQueryOptions(roundId));
    else if (round.status === "in-progress") await queryClient.ensureQueryData(getRoundCardsQueryOptions(roundId));
    return null;
  };

/** `/rounds/:roundId`: the walk-through's bench cards while in progress; its summary once finished (the mail links here). */
export default function RoundRoute() {
  const roundId = parseRoundId(useParams());
  const { data: answer } = useRound(roundId);
  const { round } = answer;
  if (round.status === "finished") return <FinishedRound roundId={roundId} />;
  if (round.status === "abandoned") return <AbandonedRound round={round} />;
  return <WalkRound roundId={roundId} />;
}

function checkStateOf(card: BenchCard, pendingChecks: readonly number[]): CheckState {
  if (card.check) return { kind: "checked", atMs: card.check.atMs, by: card.check.by.name };
  if (pendingChecks.includes(card.benchId)) return { kind: "waiting" };
  return { kind: "unchecked" };
}

function WalkRound({ roundId }: { roundId: number }) {
  const { data: answer } = useRoundCards(roundId);
  const { round, cards } = answer;
  const { unit } = useTemperatureUnit();
  const { isAllowed } = useAuthorization();
  const canWalk = isAllowed(ALLOWED.recordWork);
  const isOnline = useIsOnline();
  const { photoStore } = useOfflineQueue();
  const waiting = useWaitingEntries();
  const pendingChecks = usePendingChecks(roundId);
  const check = useCheckBench();
  const uncheck = useUncheckBench();
  const finish = useFinishRound();
  const abandon = useAbandonRound();
  const { showToast } = useToast();
  const [confirming, setConfirming] = useState<"finish" | "abandon" | null>(null);
  const tz = round.timeZone;

  const states = cards.map((card) => ({ card, check: checkStateOf(card, pendingChecks) }));
  const unchecked = states.filter((s) => s.check.kind === "unchecked");

  function onCheck(card: BenchCard) {
    check.mutate({ label: `Check-off · ${card.benchName}`, detail: `${round.scopeLabel}, round of ${formatSiteDateTime(round.startedAtMs, tz)}`, roundId, benchId: card.benchId, input: { checkedAtMs: Date.now() } });
    // On to the next bench still to do, in walking order.
    const after = states.slice(states.findIndex((s) => s.card.benchId === card.benchId) + 1).find((s) => s.check.kind === "unchecked");
    if (after) document.getElementById(`bench-${after.card.benchId}`)?.scrollIntoView?.({ behavior: "smooth", block: "start" });
  }

  function onFinish() {
    setConfirming(null);
    finish.mutate(roundId, {
      onSuccess: ({ summary }) => {
        showToast(summary.mailedTo.length > 0 ? `Walk-through finished; the summary went to ${summary.mailedTo.join(", ")}` : "Walk-through finished");
        window.scrollTo?.({ top: 0 });
      },
      onError: (error) => showToast(`Not finished: ${error.message}`, "error"),
    });
  }

  const canFinish = isOnline && waiting.length === 0;

  return (
    <div className="flex flex-col gap-4">
      <title>{`Walk-through · ${round.scopeLabel} · Benchwarden`}</title>
      <div>
        <h1 className="text-3xl font-bold leading-tight">Walk-through: {round.scopeLabel}</h1>
        <p className="text-lg">
          Started {formatSiteDateTime(round.startedAtMs, tz)} by {round.startedBy.name}
        </p>
      </div>
      <RoundProgress benches={states.map((s) => ({ benchId: s.card.benchId, benchName: s.card.benchName, check: s.check }))} />
      {!isOnline && (
        <Notice tone="warning" title="No connection">
          Keep going: observations and check-offs are kept on this tablet and sent when the connection returns.
        </Notice>
      )}
      <div className="flex flex-col gap-6">
        {states.map(({ card, check: state }, i) => (
          <BenchRoundCard
            key={card.benchId}
            card={card}
            place={i + 1}
            total={cards.length}
            unit={unit}
            timeZone={tz}
            check={state}
            onCheck={canWalk ? () => onCheck(card) : null}
            onUncheck={canWalk && isOnline ? () => uncheck.mutate({ roundId, benchId: card.benchId }, { onError: (e) => showToast(`Not undone: ${e.message}`, "error") }) : null}
            isUncheckBusy={uncheck.isPending && uncheck.variables?.benchId === card.benchId}
            batches={card.batches.map((batch) => (
              <BatchOnBench
                key={batch.id}
                batch={batch}
                benchName={card.benchName}
                roundId={roundId}
                timeZone={tz}
                batchHref={paths.batch.to(batch.id)}
                photoKeeper={photoStore}
                isOnline={isOnline}
                canRecord={canWalk}
              />
            ))}
          />
        ))}
      </div>

      {canWalk && (
        <section aria-labelledby="finish-heading" className="mt-4 flex flex-col gap-3 rounded-2xl border-2 border-ink bg-surface p-4">
          <h2 id="finish-heading" className="text-2xl font-bold">
            Finish
          </h2>
          <p className="text-lg">
            {unchecked.length === 0 ? "Every bench is checked." : `${unchecked.length} of ${cards.length} benches not checked yet.`} The summary is saved and mailed to the managers.
          </p>
          {!isOnline && <p className="text-lg font-semibold text-high">Finishing needs a connection.</p>}
          {isOnline && waiting.length > 0 && <p className="text-lg font-semibold text-high">Wait until everything entered here is sent ({waiting.length} waiting).</p>}
          <div className="flex flex-wrap gap-3">
            <Button variant="primary" className="min-h-16 flex-1 text-xl" disabled={!canFinish} isBusy={finish.isPending} onClick={() => (unchecked.length > 0 ? setConfirming("finish") : onFinish())}>
              Finish the walk-through
            </Button>
            <Button variant="quiet" disabled={!isOnline} onClick={() => setConfirming("abandon")}>
              Give up this round
            </Button>
          </div>
        </section>
      )}

      {confirming === "finish" && (
        <ConfirmDialog title="Finish with benches not checked?" confirmLabel="Finish anyway" onConfirm={onFinish} onCancel={() => setConfirming(null)}>
          <p>The summary will list them as not checked:</p>
          <ul className="mt-2 list-disc pl-6">
            {unchecked.map((s) => (
              <li key={s.card.benchId}>{s.card.benchName}</li>
            ))}
          </ul>
        </ConfirmDialog>
      )}
      {confirming === "abandon" && (
        <ConfirmDialog
          title="Give up this round?"
          confirmLabel="Give it up"
          confirmVariant="danger"
          isBusy={abandon.isPending}
          onConfirm={() => abandon.mutate(roundId, { onSettled: () => setConfirming(null), onError: (e) => showToast(`Not given up: ${e.message}`, "error") })}
          onCancel={() => setConfirming(null)}
        >
          <p>No summary is saved or mailed. Observations recorded stay with their batches.</p>
        </ConfirmDialog>
      )}
    </div>
  );
}

function FinishedRound({ roundId }: { roundId: number }) {
  const { data: answer } = useRoundSummary(roundId);
  const { summary } = answer;
  const { unit } = useTemperatureUnit();
  return (
    <div className="mx-auto flex max-w-5xl flex-col gap-4">
      <title>{`Walk-through summary · ${summary.scopeLabel} · Benchwarden`}</title>
      <div className="flex flex-wrap items-center gap-3">
        <LinkButton to={paths.rounds.to()}>
          <span aria-hidden="true">←</span> Walk-throughs
        </LinkButton>
        <h1 className="text-3xl font-bold leading-tight">Walk-through summary: {summary.scopeLabel}</h1>
      </div>
      <RoundSummaryView
        summary={summary}
        unit={unit}
        photos={
          summary.photoCount > 0 ? (
            <PanelBoundary>
              <RoundPhotos roundId={roundId} />
            </PanelBoundary>
          ) : null
        }
      />
    </div>
  );
}

/** The round's observations with photos, from the cards (which carry each batch's observations of this round). */
function RoundPhotos({ roundId }: { roundId: number }) {
  const { data } = useQuery(getRoundCardsQueryOptions(roundId));
  if (!data) return <p className="text-lg text-muted">Loading photos…</p>;
  const withPhotos = data.cards.flatMap((card) =>
    card.batches.flatMap((batch) => batch.observationsThisRound.filter((o) => o.photos.length > 0).map((o) => ({ o, batch, card }))),
  );
  return (
    <section aria-labelledby="summary-photos">
      <h2 id="summary-photos" className="text-2xl font-bold">
        Photos
      </h2>
      <ul className="mt-2 flex flex-col gap-3">
        {withPhotos.map(({ o, batch, card }) => (
          <li key={o.id} className="rounded-xl border-2 border-line bg-surface p-3">
            <p className="text-lg font-bold">
              {batch.variety} · {card.benchName}
            </p>
            <ObservationLine observation={o} subject={batch.variety} />
          </li>
        ))}
      </ul>
    </section>
  );
}

function AbandonedRound({ round }: { round: RoundView }) {
  return (
    <div className="mx-auto flex max-w-2xl flex-col gap-4 py-4">
      <title>Walk-through given up · Benchwarden</title>
      <h1 className="text-3xl font-bold">This walk-through was given up</h1>
      <p className="text-lg">
        {round.scopeLabel}, started {formatSiteDateTime(round.startedAtMs, round.timeZone)} by {round.startedBy.name}: {round.checkedCount} of {round.benchCount} benches were checked. No summary was saved.
      </p>
      <LinkButton to={paths.rounds.to()} variant="primary" className="self-start">
        Start a new walk-through
      </LinkButton>
    </div>
  );
}

export const ErrorBoundary = RouteError;
