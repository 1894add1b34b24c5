/**
 * Retry schedule of the mail outbox: exponential back-off, doubling from `baseMs` after the first
 * failed attempt and capped at `maxMs` (defaults 5 s → 10 min; MAIL_RETRY_BASE_MS / MAIL_RETRY_MAX_MS).
 * The cap is also the longest a queued message waits after the relay comes back from an outage.
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

/** Error codes (nodemailer's and the socket's) of a relay that could not be reached or did not answer. */
const UNREACHABLE = new Set(['ECONNECTION', 'ETIMEDOUT', 'ESOCKET', 'EDNS', 'ECONNREFUSED', 'ECONNRESET', 'EHOSTUNREACH', 'ENETUNREACH', 'EPIPE']);

/** True when the attempt never got an SMTP answer: the relay is down or unreachable, the message is not at fault. */
export function relayUnreachable(error: { responseCode?: number; code?: string } | undefined): boolean {
	return typeof error?.responseCode !== 'number' && UNREACHABLE.has(error?.code ?? '');
}

/**
 * Permanent SMTP refusals (5xx: unknown mailbox, message too large) are not retried; neither is an
 * attempt number that reached `maxAttempts` — unless the relay could not be reached at all: an
 * outage of any length never fails a message, it waits (at most `maxMs` between tries) and goes out
 * once the relay answers. Everything else (refused connection, timeout, 4xx) is retried.
 */
export function decideRetry(
	attempt: number,
	error: { responseCode?: number; code?: string } | undefined,
	options: BackoffOptions & { maxAttempts: number }
): RetryDecision {
	const code = error?.responseCode;
	if (typeof code === 'number' && code >= 500 && code < 600) return { retry: false };
	if (attempt >= options.maxAttempts && !relayUnreachable(error)) return { retry: false };
	return { retry: true, delayMs: retryDelayMs(attempt, options) };
}
