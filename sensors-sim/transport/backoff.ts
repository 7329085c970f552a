/** Reconnect delays: exponential back-off with "equal jitter" (half fixed, half random). */
export interface BackoffOptions {
  /** Delay before the first reconnect attempt, ms. */
  initialMs: number;
  /** Ceiling of the exponential part, ms. */
  maxMs: number;
  factor: number;
}

export const DEFAULT_BACKOFF: BackoffOptions = { initialMs: 500, maxMs: 30_000, factor: 2 };

/**
 * Delay before reconnect attempt number `attempt` (0 for the first), ms: between half and all
 * of min(maxMs, initialMs · factor^attempt). `random` is in [0, 1).
 */
export function backoffDelayMs(attempt: number, random: number, o: BackoffOptions = DEFAULT_BACKOFF): number {
  const ceiling = Math.min(o.maxMs, o.initialMs * o.factor ** Math.max(0, attempt));
  return Math.round(ceiling / 2 + (ceiling / 2) * random);
}
