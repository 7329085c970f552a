import { QueryClient } from "@tanstack/react-query";
import { isApiError } from "./api-client";

/** How often every query refetches on its own, as a fallback for when the live stream drops. */
export const FALLBACK_REFETCH_MS = 60_000;

function shouldRetry(failureCount: number, error: unknown): boolean {
  // A 4xx will not get better by asking again; network errors and 5xx get two more tries.
  if (isApiError(error) && error.status >= 400 && error.status < 500) return false;
  return failureCount < 2;
}

export function createQueryClient(): QueryClient {
  return new QueryClient({
    defaultOptions: {
      queries: {
        staleTime: 20_000,
        retry: shouldRetry,
        refetchOnWindowFocus: true,
      },
    },
  });
}
