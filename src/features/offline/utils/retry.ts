import { isApiError } from "../../../lib/api-client";

/** How many times a server error (5xx) is tried again before the entry is given up as not sent. */
export const SERVER_ERROR_TRIES = 8;

/**
 * Whether work waiting to send (an observation, a check-off) should be tried again. No connection,
 * a signed-out session (sent once someone signs in again), a timeout or a busy server are
 * passing troubles: the entry keeps waiting. A refusal (400, 403, 404, 409) will not change by
 * asking again: the entry is given up and shown as not sent, with the server's reason.
 */
export function shouldKeepTrying(failureCount: number, error: unknown): boolean {
  if (!isApiError(error)) return false;
  if (error.status === 0 || error.status === 401 || error.status === 408 || error.status === 429) return true;
  if (error.status >= 500) return failureCount < SERVER_ERROR_TRIES;
  return false;
}

/** 1 s, 2 s, 4 s … at most 30 s between tries while the connection is patchy. */
export function retryDelayMs(failureCount: number): number {
  return Math.min(30_000, 1_000 * 2 ** Math.max(0, failureCount - 1));
}
