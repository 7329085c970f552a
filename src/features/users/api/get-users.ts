import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { usersResponseSchema } from "../../../../shared/schemas/auth.js";
import { apiGet } from "../../../lib/api-client";

/** GET /api/users (admin): every account, invited or active or disabled. */
export function getUsers({ signal }: { signal?: AbortSignal } = {}) {
  return apiGet("/api/users", usersResponseSchema, { signal });
}

export function getUsersQueryOptions() {
  return queryOptions({
    queryKey: ["users", "list"] as const,
    queryFn: ({ signal }) => getUsers({ signal }),
  });
}

export function useUsers() {
  return useSuspenseQuery(getUsersQueryOptions());
}
