import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { windowPresetsResponseSchema } from "../../../../shared/schemas/windows.js";
import { apiGet } from "../../../lib/api-client";

/** GET /api/window-presets (every role): the built-in presets with their sources, then the nursery's own by name. */
export function getWindowPresets({ signal }: { signal?: AbortSignal } = {}) {
  return apiGet("/api/window-presets", windowPresetsResponseSchema, { signal });
}

export function getWindowPresetsQueryOptions() {
  return queryOptions({
    queryKey: ["windows", "presets"] as const,
    queryFn: ({ signal }) => getWindowPresets({ signal }),
  });
}

export function useWindowPresets() {
  return useSuspenseQuery(getWindowPresetsQueryOptions());
}
