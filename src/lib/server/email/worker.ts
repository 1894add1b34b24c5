/**
 * The outbox worker: claims due messages (`FOR UPDATE SKIP LOCKED`, so any number of app processes
 * and `scripts/mail-worker.ts` can run side by side), sends each through the one SMTP transport,
 * and records the outcome: sent (once), queued again after a back-off, or failed.
 */
import { config } from '../config';
import { isDatabaseDownError } from '../db';
import {
	claimDueMail,
	markMailFailed,
	markMailRetry,
	markMailSent,
	type ClaimedMail
} from '../repositories/mail-outbox';
import { decideRetry } from './backoff';
import { onMailNudge } from './outbox';
import { mailFrom, mailTransport } from './transport';

export interface MailWorkerOptions {
	/** idle wait between passes, ms (MAIL_POLL_MS) */
	pollMs: number;
	/** messages claimed and sent in parallel per pass */
	batchSize: number;
	/** how long a claim is held before another worker may take the message over, ms */
	leaseMs: number;
	retryBaseMs: number;
	retryMaxMs: number;
	maxAttempts: number;
	log: (message: string) => void;
}

export interface DeliveryPass {
	claimed: number;
	sent: number;
	retried: number;
	failed: number;
}

function defaults(): MailWorkerOptions {
	const mail = config.mail;
	return {
		pollMs: mail.pollMs,
		batchSize: 5,
		leaseMs: mail.leaseMs,
		retryBaseMs: mail.retryBaseMs,
		retryMaxMs: mail.retryMaxMs,
		maxAttempts: mail.maxAttempts,
		log: (m) => console.log(`[mail] ${m}`)
	};
}

async function send(mail: ClaimedMail): Promise<void> {
	await mailTransport().sendMail({
		from: mailFrom(),
		to: mail.toAddress,
		replyTo: mail.replyTo ?? undefined,
		subject: mail.subject,
		text: mail.text,
		html: mail.html ?? undefined,
		messageId: mail.messageId,
		headers: { 'X-Traywise-Kind': mail.kind },
		attachments: mail.attachments.map((a) => ({ filename: a.filename, contentType: a.contentType, content: a.content }))
	});
}

function describe(err: unknown): string {
	const e = err as { code?: string; responseCode?: number; message?: string };
	return [e.code, e.responseCode, e.message ?? String(err)].filter((p) => p !== undefined && p !== '').join(' ');
}

/** One pass: claim what is due, send it, record each outcome. */
export async function deliverDueMail(overrides: Partial<MailWorkerOptions> = {}): Promise<DeliveryPass> {
	const o = { ...defaults(), ...overrides };
	const claimed = await claimDueMail(o.batchSize, o.leaseMs, o.maxAttempts);
	const pass: DeliveryPass = { claimed: claimed.length, sent: 0, retried: 0, failed: 0 };
	await Promise.all(
		claimed.map(async (mail) => {
			try {
				await send(mail);
			} catch (err) {
				const decision = decideRetry(mail.attempts, err as { responseCode?: number; code?: string }, {
					baseMs: o.retryBaseMs,
					maxMs: o.retryMaxMs,
					maxAttempts: o.maxAttempts
				});
				const reason = describe(err);
				if (decision.retry) {
					await markMailRetry(mail.id, mail.claimId, reason, decision.delayMs);
					pass.retried++;
				} else {
					await markMailFailed(mail.id, mail.claimId, reason);
					pass.failed++;
					o.log(`gave up on ${mail.id} (${mail.kind}) after attempt ${mail.attempts}: ${reason}`);
				}
				return;
			}
			if (await markMailSent(mail.id, mail.claimId)) pass.sent++;
			// the lease lapsed mid-send and another worker took the message over; it may go twice
			else o.log(`sent ${mail.id} after losing its claim (lease ${o.leaseMs} ms too short?)`);
		})
	);
	return pass;
}

export interface MailWorker {
	/** wake the worker now */
	nudge(): void;
	/** finish the pass in progress, then stop */
	stop(): Promise<void>;
}

/** Runs passes until stopped: immediately while there is more due, else every `pollMs` or on a nudge. */
export function startMailWorker(overrides: Partial<MailWorkerOptions> = {}): MailWorker {
	const o = { ...defaults(), ...overrides };
	let stopped = false;
	let nudged = false;
	let wake: (() => void) | null = null;
	let lastProblem = '';

	const nudge = () => {
		nudged = true;
		wake?.();
	};
	const unsubscribe = onMailNudge(nudge);

	const sleep = (ms: number) =>
		new Promise<void>((resolve) => {
			if (nudged || stopped) return resolve();
			const timer = setTimeout(done, ms);
			function done() {
				clearTimeout(timer);
				wake = null;
				resolve();
			}
			wake = done;
		});

	const running = (async () => {
		while (!stopped) {
			nudged = false;
			let more = false;
			try {
				const pass = await deliverDueMail(o);
				more = pass.claimed >= o.batchSize;
				lastProblem = '';
			} catch (err) {
				// e.g. the database is down or restarting: wait and try again, logging once per problem
				const problem = isDatabaseDownError(err) ? 'the database is not reachable' : describe(err);
				if (problem !== lastProblem) o.log(`outbox pass failed: ${problem}`);
				lastProblem = problem;
			}
			if (!stopped && !more) await sleep(o.pollMs);
		}
	})();

	return {
		nudge,
		async stop() {
			stopped = true;
			unsubscribe();
			wake?.();
			await running;
		}
	};
}

const IN_APP = Symbol.for('traywise.mail-worker');
type WithWorker = typeof globalThis & { [IN_APP]?: MailWorker };

/**
 * Starts the worker for this app process once, however often it is called (hooks `init`, dev
 * reloads). MAIL_WORKER_IN_APP=false leaves delivery to `scripts/mail-worker.ts`.
 */
export function startInAppMailWorker(): MailWorker | null {
	if (!config.mail.workerInApp) return null;
	const g = globalThis as WithWorker;
	g[IN_APP] ??= startMailWorker();
	return g[IN_APP];
}
