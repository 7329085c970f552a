import type { QueryClient } from "@tanstack/react-query";
import type { BatchView } from "../../../../shared/schemas/batches.js";
import { getBatchQueryOptions } from "./get-batch";
import { BENCH_OBSERVATION_LISTS_KEY } from "./get-bench-observations";
import { BATCH_LISTS_KEY } from "./get-batches";
import { getObservationsQueryOptions } from "./get-observations";

/**
 * After a batch changed (created, edited, moved, closed, observed): the detail is replaced by the
 * server's answer when there is one; lists, its observations, the charts' observation markers and
 * every report are asked again.
 * Reports are keyed ["reports", …] (features/reports); the key is spelled here to keep features apart.
 */
export async function invalidateAfterBatchChange(queryClient: QueryClient, batchId: number, batch?: BatchView) {
  if (batch) queryClient.setQueryData(getBatchQueryOptions(batchId).queryKey, { batch });
  await Promise.all([
    batch ? Promise.resolve() : queryClient.invalidateQueries({ queryKey: getBatchQueryOptions(batchId).queryKey }),
    queryClient.invalidateQueries({ queryKey: getObservationsQueryOptions(batchId).queryKey }),
    queryClient.invalidateQueries({ queryKey: BENCH_OBSERVATION_LISTS_KEY }),
    queryClient.invalidateQueries({ queryKey: BATCH_LISTS_KEY }),
    queryClient.invalidateQueries({ queryKey: ["reports"] }),
  ]);
}
