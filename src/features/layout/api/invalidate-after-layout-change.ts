import type { QueryClient } from "@tanstack/react-query";

/**
 * What a layout change touches: the layout itself, the dashboard's zones (['zones']), the window
 * views that carry names and bench lists (['windows']) and the audit trail (['audit']). Keys are
 * written out because features do not import each other (STYLE.md §1, §4).
 */
export function invalidateAfterLayoutChange(queryClient: QueryClient) {
  return Promise.all([["layout"], ["zones"], ["windows"], ["audit"]].map((queryKey) => queryClient.invalidateQueries({ queryKey })));
}
