/**
 * Retry schedule of the mail outbox: exponential back-off, doubling from `baseMs` after the first
 * failed attempt and capped at `maxMs` (defaults 5 s → 10 min; MAIL_RETRY_BASE_MS / MAIL_RETRY_MAX_MS).
 * Pure, so the schedule is tested without a clock.
 */
export interface BackoffOptions {
	baseMs: number;
	maxMs: number;
}

/** Milliseconds to wait after failed attempt number `attempt` (1 = the first try failed). */
export function retryDelayMs(attempt: number, { baseMs, maxMs }: BackoffOptions): number {
	if (!Number.isInteger(attempt) || attempt < 1) throw new Error(`attempt must be a positive integer, got ${attempt}`);
	// 2 ** 40 already exceeds any sane cap; clamping the exponent keeps the number finite
	const delay = baseMs * 2 ** Math.min(attempt - 1, 40);
	return Math.min(delay, maxMs);
}

/** What to do after a failed attempt: try again at a time, or give up. */
export type RetryDecision = { retry: true; delayMs: number } | { retry: false };

/**
 * Permanent SMTP refusals (5xx: unknown mailbox, message too large) are not retried; neither is an
 * attempt number that reached `maxAttempts`. Everything else (refused connection, timeout, 4xx) is.
 */
export function decideRetry(
	attempt: number,
	error: { responseCode?: number } | undefined,
	options: BackoffOptions & { maxAttempts: number }
): RetryDecision {
	const code = error?.responseCode;
	if (typeof code === 'number' && code >= 500 && code < 600) return { retry: false };
	if (attempt >= options.maxAttempts) return { retry: false };
	return { retry: true, delayMs: retryDelayMs(attempt, options) };
}
