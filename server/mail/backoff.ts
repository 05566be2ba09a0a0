/** How long the outbox waits before the next attempt after a failed one. */
export interface BackoffOptions {
  /** Delay after the first failure (default 5 s); each further failure doubles it. */
  baseMs: number
  /** Upper bound of the delay (default 10 min). */
  maxMs: number
  /**
   * Share of the delay drawn at random, 0 ... 1 (default 0.2): the wait is between
   * (1 - jitter) x delay and delay, so processes retrying after one outage spread out.
   */
  jitter: number
}

export const DEFAULT_BACKOFF: BackoffOptions = { baseMs: 5_000, maxMs: 10 * 60_000, jitter: 0.2 }

/**
 * Capped exponential backoff with jitter: attempt 1 failed -> about baseMs, 2 -> 2 x baseMs,
 * 3 -> 4 x baseMs ..., never above maxMs. `random` returns values in [0, 1).
 */
export function retryDelayMs(failedAttempts: number, options: BackoffOptions = DEFAULT_BACKOFF, random: () => number = Math.random): number {
  if (!Number.isInteger(failedAttempts) || failedAttempts < 1) throw new RangeError(`failedAttempts must be a positive integer, got ${failedAttempts}`)
  const exponent = Math.min(failedAttempts - 1, 30)
  const ceiling = Math.min(options.maxMs, options.baseMs * 2 ** exponent)
  const jitter = Math.min(Math.max(options.jitter, 0), 1)
  return Math.round(ceiling * (1 - jitter * random()))
}
