import type { QueryClient } from "@tanstack/react-query";
import { useState } from "react";
import { useParams, type LoaderFunction } from "react-router-dom";
import { PanelBoundary } from "../../../components/errors/panel-boundary";
import { RouteError } from "../../../components/errors/route-error";
import { Button, buttonClasses } from "../../../components/ui/button";
import { ConfirmDialog } from "../../../components/ui/dialog";
import { LinkButton } from "../../../components/ui/link-button";
import { useToast } from "../../../components/ui/toast";
import { paths } from "../../../config/paths";
import { getBatchQueryOptions, useBatch } from "../../../features/batches/api/get-batch";
import { getObservationsQueryOptions, useObservations } from "../../../features/batches/api/get-observations";
import { useReopenBatch } from "../../../features/batches/api/reopen-batch";
import { BatchFacts, PlacementHistory } from "../../../features/batches/components/batch-facts";
import { CloseBatchDialog } from "../../../features/batches/components/close-batch-dialog";
import { MoveBatchDialog } from "../../../features/batches/components/move-batch-dialog";
import { ObservationTimeline } from "../../../features/batches/components/observation-timeline";
import { QuickObservation } from "../../../features/batches/components/quick-observation";
import { getLayoutQueryOptions, useLayout } from "../../../features/layout/api/get-layout";
import { useIsOnline, useOfflineQueue } from "../../../features/offline/hooks/offline-queue";
import { observationsCsvUrl } from "../../../features/reports/api/export-urls";
import { ALLOWED, useAuthorization } from "../../../lib/authorization";
import { parseBatchId } from "./edit-batch";
import { benchGroupsOf, siteToday } from "./layout-choices";

export const clientLoader =
  (queryClient: QueryClient): LoaderFunction =>
  async ({ params }) => {
    const batchId = parseBatchId(params);
    await Promise.all([
      queryClient.ensureQueryData(getBatchQueryOptions(batchId)),
      queryClient.ensureQueryData(getLayoutQueryOptions()),
      queryClient.prefetchQuery(getObservationsQueryOptions(batchId)),
    ]);
    return null;
  };

/** `/batches/:batchId`: the batch's figures and fields, its observations over time with photos, its benches. */
export default function BatchRoute() {
  const batchId = parseBatchId(useParams());
  const { data: answer } = useBatch(batchId);
  const { batch } = answer;
  const { data: layout } = useLayout();
  const { isAllowed } = useAuthorization();
  const canRecord = isAllowed(ALLOWED.recordWork);
  const isOnline = useIsOnline();
  const { photoStore } = useOfflineQueue();
  const reopen = useReopenBatch();
  const { showToast } = useToast();
  const [dialog, setDialog] = useState<"move" | "close" | "reopen" | null>(null);
  const [isEntering, setIsEntering] = useState(false);
  const isOpen = batch.status === "open";

  return (
    <div className="flex flex-col gap-6">
      <title>{`${batch.variety} · Batches · Benchwarden`}</title>
      <div className="flex flex-wrap items-center gap-3">
        <LinkButton to={paths.batches.to()}>
          <span aria-hidden="true">←</span> Batches
        </LinkButton>
        <div className="min-w-0 flex-1">
          <h1 className="text-3xl font-bold leading-tight">{batch.variety}</h1>
          <p className="text-lg">
            {isOpen ? "On" : "Was on"} {batch.bench.benchName} · {batch.bench.zoneName}
            {isOpen ? "" : " · closed"}
          </p>
        </div>
      </div>

      {canRecord && (
        <div className="flex flex-wrap gap-3">
          {isOpen && (
            <>
              <LinkButton to={paths.editBatch.to(batch.id)}>Edit</LinkButton>
              <Button onClick={() => setDialog("move")}>Move to another bench</Button>
              <Button onClick={() => setDialog("close")}>Close with an outcome</Button>
            </>
          )}
          {!isOpen && <Button onClick={() => setDialog("reopen")}>Reopen</Button>}
        </div>
      )}

      <BatchFacts batch={batch} />

      <section aria-labelledby="observations-heading" className="flex flex-col gap-3">
        <div className="flex flex-wrap items-center justify-between gap-3">
          <h2 id="observations-heading" className="text-2xl font-bold">
            Observations
          </h2>
          <a href={observationsCsvUrl({ status: "all", batchId: batch.id })} download className={buttonClasses("secondary")}>
            <span aria-hidden="true">⤓</span> Observations CSV
          </a>
        </div>
        {canRecord &&
          isOpen &&
          (isEntering ? (
            <QuickObservation
              batch={batch}
              benchName={batch.bench.benchName}
              roundId={null}
              timeZone={batch.bench.timeZone}
              photoKeeper={photoStore}
              isOnline={isOnline}
              onDone={() => setIsEntering(false)}
            />
          ) : (
            <Button variant="primary" className="min-h-14 self-start" onClick={() => setIsEntering(true)}>
              Record observation
            </Button>
          ))}
        <PanelBoundary>
          <Observations batchId={batch.id} variety={batch.variety} />
        </PanelBoundary>
      </section>

      <section aria-labelledby="placements-heading" className="flex flex-col gap-3">
        <h2 id="placements-heading" className="text-2xl font-bold">
          Benches it has been on
        </h2>
        <PlacementHistory batch={batch} />
      </section>

      {dialog === "move" && <MoveBatchDialog batch={batch} benchGroups={benchGroupsOf(layout)} onClose={() => setDialog(null)} />}
      {dialog === "close" && <CloseBatchDialog batch={batch} today={siteToday(layout, batch.bench.siteId)} onClose={() => setDialog(null)} />}
      {dialog === "reopen" && (
        <ConfirmDialog
          title={`Reopen ${batch.variety}?`}
          confirmLabel="Reopen"
          isBusy={reopen.isPending}
          onCancel={() => setDialog(null)}
          onConfirm={() =>
            reopen.mutate(batch.id, {
              onSuccess: () => showToast(`${batch.variety} is open again`),
              onError: (e) => showToast(`Not reopened: ${e.message}`, "error"),
              onSettled: () => setDialog(null),
            })
          }
        >
          <p>Its outcome and final counts are cleared; observations stay.</p>
        </ConfirmDialog>
      )}
    </div>
  );
}

function Observations({ batchId, variety }: { batchId: number; variety: string }) {
  const { data } = useObservations(batchId);
  return <ObservationTimeline batchId={batchId} variety={variety} observations={data.observations} />;
}

export const ErrorBoundary = RouteError;
