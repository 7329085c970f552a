import type { QueryClient } from "@tanstack/react-query";
import { useNavigate, useSearchParams, type LoaderFunction } from "react-router-dom";
import { RouteError } from "../../../components/errors/route-error";
import { useToast } from "../../../components/ui/toast";
import { paths } from "../../../config/paths";
import { useCreateBatch } from "../../../features/batches/api/create-batch";
import { BatchForm } from "../../../features/batches/components/batch-form";
import { getLayoutQueryOptions, useLayout } from "../../../features/layout/api/get-layout";
import { ALLOWED } from "../../../lib/authorization";
import { requireRole } from "../../session-guard";
import { benchGroupsOf, siteToday } from "./layout-choices";

export const clientLoader =
  (queryClient: QueryClient): LoaderFunction =>
  async () => {
    await requireRole(queryClient, ALLOWED.recordWork);
    await queryClient.ensureQueryData(getLayoutQueryOptions());
    return null;
  };

/** `/batches/new`: stick a new batch on a bench. */
export default function NewBatchRoute() {
  const { data: layout } = useLayout();
  const [search] = useSearchParams();
  const navigate = useNavigate();
  const create = useCreateBatch();
  const { showToast } = useToast();
  const bench = Number(search.get("bench"));

  return (
    <div className="mx-auto flex max-w-4xl flex-col gap-4">
      <title>New batch · Benchwarden</title>
      <h1 className="text-3xl font-bold">New batch</h1>
      <BatchForm
        benchGroups={benchGroupsOf(layout)}
        today={siteToday(layout)}
        defaultBenchId={Number.isSafeInteger(bench) && bench > 0 ? bench : undefined}
        isBusy={create.isPending}
        submitLabel="Save the batch"
        onCancel={() => void navigate(paths.batches.to())}
        onCreate={(input, _form, showServerError) =>
          create.mutate(input, {
            onSuccess: ({ batch }) => {
              showToast(`${batch.variety} is on ${batch.bench.benchName}`);
              void navigate(paths.batch.to(batch.id));
            },
            onError: showServerError,
          })
        }
      />
    </div>
  );
}

export const ErrorBoundary = RouteError;
