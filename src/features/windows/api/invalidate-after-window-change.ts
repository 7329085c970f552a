import type { QueryClient } from "@tanstack/react-query";

/**
 * What a saved window changes: the window views, the dashboard's statuses (['zones']), the chart
 * bands (['readings']), the layout's override markers (['layout']) and the audit trail (['audit']).
 * Keys are written out because features do not import each other (STYLE.md §1, §4).
 */
export function invalidateAfterWindowChange(queryClient: QueryClient) {
  return Promise.all(
    [["windows"], ["zones"], ["readings"], ["layout"], ["audit"]].map((queryKey) => queryClient.invalidateQueries({ queryKey })),
  );
}
