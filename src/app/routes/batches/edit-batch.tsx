import type { QueryClient } from "@tanstack/react-query";
import { data, useNavigate, useParams, type LoaderFunction, type Params } from "react-router-dom";
import { RouteError } from "../../../components/errors/route-error";
import { useToast } from "../../../components/ui/toast";
import { paths } from "../../../config/paths";
import { getBatchQueryOptions, useBatch } from "../../../features/batches/api/get-batch";
import { useUpdateBatch } from "../../../features/batches/api/update-batch";
import { BatchForm } from "../../../features/batches/components/batch-form";
import { getLayoutQueryOptions, useLayout } from "../../../features/layout/api/get-layout";
import { ALLOWED } from "../../../lib/authorization";
import { requireRole } from "../../session-guard";
import { benchGroupsOf, siteToday } from "./layout-choices";

export function parseBatchId(params: Params): number {
  const batchId = Number(params.batchId);
  if (!Number.isSafeInteger(batchId) || batchId <= 0) throw data("There is no batch with that number.", { status: 404, statusText: "Not found" });
  return batchId;
}

export const clientLoader =
  (queryClient: QueryClient): LoaderFunction =>
  async ({ params }) => {
    await requireRole(queryClient, ALLOWED.recordWork);
    await Promise.all([queryClient.ensureQueryData(getBatchQueryOptions(parseBatchId(params))), queryClient.ensureQueryData(getLayoutQueryOptions())]);
    return null;
  };

/** `/batches/:batchId/edit`: correct the batch's own fields (the bench changes by a move). */
export default function EditBatchRoute() {
  const batchId = parseBatchId(useParams());
  const { data: answer } = useBatch(batchId);
  const { data: layout } = useLayout();
  const navigate = useNavigate();
  const update = useUpdateBatch();
  const { showToast } = useToast();
  const { batch } = answer;

  return (
    <div className="mx-auto flex max-w-4xl flex-col gap-4">
      <title>{`Edit ${batch.variety} · Benchwarden`}</title>
      <h1 className="text-3xl font-bold">Edit {batch.variety}</h1>
      <BatchForm
        batch={batch}
        benchGroups={benchGroupsOf(layout)}
        today={siteToday(layout, batch.bench.siteId)}
        isBusy={update.isPending}
        submitLabel="Save changes"
        onCancel={() => void navigate(paths.batch.to(batch.id))}
        onUpdate={(input, _form, showServerError) => {
          if (Object.keys(input).length === 0) {
            void navigate(paths.batch.to(batch.id));
            return;
          }
          update.mutate(
            { batchId: batch.id, input },
            {
              onSuccess: () => {
                showToast("Saved");
                void navigate(paths.batch.to(batch.id));
              },
              onError: showServerError,
            },
          );
        }}
      />
    </div>
  );
}

export const ErrorBoundary = RouteError;
