/**
 * The mail outbox: the only way Traywise sends mail. `enqueueMail` writes the message to
 * PostgreSQL (inside the caller's transaction when given); a worker (`./worker.ts`) delivers it.
 * Nothing is lost while the relay is down: the row waits, is retried with back-off, and is
 * marked sent exactly once.
 */
import { randomUUID } from 'node:crypto';
import { EventEmitter } from 'node:events';
import type { Transaction } from 'sequelize';
import type { MailKind } from '../db/models/delivery';
import { insertOutboxMail, listOutboxFor, type OutboxRow } from '../repositories/mail-outbox';
import type { BuiltMessage, MailAttachment } from './messages';
import { mailFrom } from './transport';
import { isUuid } from '../uuid';

export type { MailKind } from '../db/models/delivery';
export type { OutboxRow } from '../repositories/mail-outbox';

export interface EnqueueMailInput {
	kind: MailKind;
	/** one recipient per message, so each has its own delivery state */
	to: string;
	replyTo?: string | null;
	subject: string;
	text: string;
	html?: string | null;
	attachments?: MailAttachment[];
	/**
	 * Same key, same message: a second enqueue with a key already present adds nothing and returns
	 * the first message's id (e.g. `quote-sent:<revisionId>:<email>`). Default: a fresh key.
	 */
	dedupeKey?: string;
	/** the record the message is about, for its delivery trail (e.g. `{ type: 'quote', id }`) */
	related?: { type: string; id: string } | null;
}

/** Plain shape check of one address; the relay is the final judge. */
const ADDRESS = /^[^\s@<>(),;:"[\]\\]+@[^\s@<>(),;:"[\]\\]+\.[^\s@<>(),;:"[\]\\]+$/;

export class InvalidMailError extends Error {}

const nudges = new EventEmitter();
nudges.setMaxListeners(50);

/** Wakes this process's worker now instead of at its next poll. */
export function nudgeMailWorker(): void {
	nudges.emit('nudge');
}

/** Subscribes to nudges (used by the worker); returns the unsubscribe function. */
export function onMailNudge(listener: () => void): () => void {
	nudges.on('nudge', listener);
	return () => nudges.off('nudge', listener);
}

function messageIdDomain(): string {
	const match = /@([^>\s]+)>?\s*$/.exec(mailFrom());
	return match ? match[1] : 'traywise.invalid';
}

/**
 * Queues one message. With `transaction`, the message exists only if that transaction commits
 * (a quote moving to "sent" and its e-mail go together), and the worker is nudged after commit.
 * Throws `InvalidMailError` on an unusable address or an empty subject or body.
 */
export async function enqueueMail(
	input: EnqueueMailInput,
	options: { transaction?: Transaction } = {}
): Promise<{ id: string; created: boolean }> {
	const to = input.to.trim();
	if (!ADDRESS.test(to)) throw new InvalidMailError(`not a usable e-mail address: ${JSON.stringify(input.to)}`);
	const replyTo = input.replyTo?.trim() || null;
	if (replyTo && !ADDRESS.test(replyTo)) throw new InvalidMailError(`not a usable reply-to address: ${JSON.stringify(replyTo)}`);
	if (!input.subject.trim()) throw new InvalidMailError('a message needs a subject');
	if (!input.text.trim()) throw new InvalidMailError('a message needs a text part');
	if (input.related && !isUuid(input.related.id)) throw new InvalidMailError('related id must be a uuid');
	const result = await insertOutboxMail(
		{
			kind: input.kind,
			toAddress: to,
			replyTo,
			subject: input.subject.replace(/[\r\n]+/g, ' '),
			text: input.text,
			html: input.html ?? null,
			attachments: input.attachments ?? [],
			dedupeKey: input.dedupeKey ?? `once:${randomUUID()}`,
			messageIdDomain: messageIdDomain(),
			relatedType: input.related?.type ?? null,
			relatedId: input.related?.id ?? null
		},
		options.transaction
	);
	if (options.transaction) options.transaction.afterCommit(() => nudgeMailWorker());
	else nudgeMailWorker();
	return result;
}

/** Queues a message made by one of the builders in `./messages.ts`. */
export function enqueueBuiltMail(
	kind: MailKind,
	to: string,
	message: BuiltMessage,
	extra: Pick<EnqueueMailInput, 'replyTo' | 'dedupeKey' | 'related'> = {},
	options: { transaction?: Transaction } = {}
): Promise<{ id: string; created: boolean }> {
	return enqueueMail({ kind, to, ...message, ...extra }, options);
}

/** Every message about one record, oldest first, with its state: queued, sending, sent or failed. */
export function mailTrail(related: { type: string; id: string }): Promise<OutboxRow[]> {
	if (!isUuid(related.id)) return Promise.resolve([]);
	return listOutboxFor(related.type, related.id);
}
