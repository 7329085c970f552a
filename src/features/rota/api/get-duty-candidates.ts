import { queryOptions } from "@tanstack/react-query";
import { dutyCandidatesResponseSchema } from "../../../../shared/schemas/alerts.js";
import { apiGet } from "../../../lib/api-client";

/** GET /api/duty-rota/candidates (admin, manager): active people who can acknowledge alerts. */
export function getDutyCandidates({ signal }: { signal?: AbortSignal } = {}) {
  return apiGet("/api/duty-rota/candidates", dutyCandidatesResponseSchema, { signal });
}

export function getDutyCandidatesQueryOptions() {
  return queryOptions({
    queryKey: ["duty-rota", "candidates"] as const,
    queryFn: ({ signal }) => getDutyCandidates({ signal }),
  });
}
