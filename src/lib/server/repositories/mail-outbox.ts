import { randomUUID } from 'node:crypto';
import { QueryTypes, type Transaction } from 'sequelize';
import { sequelize } from '../db';
import { MailOutboxAttachment, type MailKind, type OutboxStatus } from '../db/models/delivery';

export interface OutboxAttachmentInput {
	filename: string;
	contentType: string;
	content: Buffer;
}

export interface NewOutboxMail {
	kind: MailKind;
	toAddress: string;
	replyTo: string | null;
	subject: string;
	text: string;
	html: string | null;
	attachments: OutboxAttachmentInput[];
	dedupeKey: string;
	/** the domain part of generated Message-IDs */
	messageIdDomain: string;
	relatedType: string | null;
	relatedId: string | null;
}

/**
 * Inserts a queued message unless one with the same dedupe key exists; returns its id either way.
 * Runs inside `transaction` when given, so the message commits (or rolls back) with the caller's work;
 * otherwise in its own, so a worker never sees a message without its attachments.
 */
export async function insertOutboxMail(
	input: NewOutboxMail,
	transaction?: Transaction
): Promise<{ id: string; created: boolean }> {
	if (!transaction && input.attachments.length > 0) {
		return sequelize.transaction((own) => insertOutboxMail(input, own));
	}
	const id = randomUUID();
	const inserted = await sequelize.query<{ id: string }>(
		`INSERT INTO mail_outbox (id, kind, to_address, reply_to, subject, text, html, message_id, dedupe_key, related_type, related_id)
		 VALUES (:id, :kind, :toAddress, :replyTo, :subject, :text, :html, :messageId, :dedupeKey, :relatedType, :relatedId)
		 ON CONFLICT (dedupe_key) DO NOTHING
		 RETURNING id`,
		{
			type: QueryTypes.SELECT,
			transaction,
			replacements: {
				id,
				kind: input.kind,
				toAddress: input.toAddress,
				replyTo: input.replyTo,
				subject: input.subject,
				text: input.text,
				html: input.html,
				messageId: `<${id}@${input.messageIdDomain}>`,
				dedupeKey: input.dedupeKey,
				relatedType: input.relatedType,
				relatedId: input.relatedId
			}
		}
	);
	if (inserted.length === 0) {
		const [existing] = await sequelize.query<{ id: string }>(`SELECT id FROM mail_outbox WHERE dedupe_key = :key`, {
			type: QueryTypes.SELECT,
			transaction,
			replacements: { key: input.dedupeKey }
		});
		return { id: existing.id, created: false };
	}
	if (input.attachments.length > 0) {
		await MailOutboxAttachment.bulkCreate(
			input.attachments.map((a, position) => ({
				outboxId: id,
				position,
				filename: a.filename,
				contentType: a.contentType,
				sizeBytes: a.content.length,
				content: a.content
			})),
			{ transaction }
		);
	}
	return { id, created: true };
}

export interface ClaimedMail {
	id: string;
	kind: MailKind;
	toAddress: string;
	replyTo: string | null;
	subject: string;
	text: string;
	html: string | null;
	messageId: string;
	attempts: number;
	claimId: string;
	attachments: OutboxAttachmentInput[];
}

/**
 * Claims up to `limit` due messages for this worker: queued ones whose time has come, and ones a
 * crashed worker left in `sending` after its lease lapsed. `FOR UPDATE SKIP LOCKED` lets several
 * workers (app processes or scripts/mail-worker.ts) claim side by side without ever sharing a row.
 */
export async function claimDueMail(limit: number, leaseMs: number, maxAttempts: number): Promise<ClaimedMail[]> {
	const claimId = randomUUID();
	// a message whose worker died mid-send on its last allowed attempt will not be tried again
	await sequelize.query(
		`UPDATE mail_outbox SET status = 'failed', locked_until = NULL, updated_at = now(),
		        last_error = coalesce(last_error || ' · ', '') || 'the worker stopped while sending, attempts used up'
		 WHERE status = 'sending' AND locked_until < now() AND attempts >= :maxAttempts`,
		{ replacements: { maxAttempts } }
	);
	const rows = await sequelize.query<{
		id: string;
		kind: MailKind;
		to_address: string;
		reply_to: string | null;
		subject: string;
		text: string;
		html: string | null;
		message_id: string;
		attempts: number;
	}>(
		`WITH due AS (
			SELECT id FROM mail_outbox
			WHERE (status = 'queued' AND next_attempt_at <= now())
			   OR (status = 'sending' AND locked_until < now())
			ORDER BY next_attempt_at
			LIMIT :limit
			FOR UPDATE SKIP LOCKED
		)
		UPDATE mail_outbox m
		SET status = 'sending', attempts = m.attempts + 1, claim_id = :claimId,
		    locked_until = now() + (:leaseMs * interval '1 millisecond'), updated_at = now()
		FROM due WHERE m.id = due.id
		RETURNING m.id, m.kind, m.to_address, m.reply_to, m.subject, m.text, m.html, m.message_id, m.attempts`,
		{ type: QueryTypes.SELECT, replacements: { limit, claimId, leaseMs } }
	);
	if (rows.length === 0) return [];
	const attachments = await MailOutboxAttachment.findAll({
		where: { outboxId: rows.map((r) => r.id) },
		order: [['position', 'ASC']]
	});
	return rows.map((r) => ({
		id: r.id,
		kind: r.kind,
		toAddress: r.to_address,
		replyTo: r.reply_to,
		subject: r.subject,
		text: r.text,
		html: r.html,
		messageId: r.message_id,
		attempts: r.attempts,
		claimId,
		attachments: attachments
			.filter((a) => a.outboxId === r.id)
			.map((a) => ({ filename: a.filename, contentType: a.contentType, content: a.content }))
	}));
}

/** Marks a claimed message sent. False when this worker no longer holds the claim. */
export async function markMailSent(id: string, claimId: string): Promise<boolean> {
	const [, count] = await sequelize.query(
		`UPDATE mail_outbox SET status = 'sent', sent_at = now(), locked_until = NULL, last_error = NULL, updated_at = now()
		 WHERE id = :id AND claim_id = :claimId AND status = 'sending'`,
		{ type: QueryTypes.UPDATE, replacements: { id, claimId } }
	);
	return count > 0;
}

/** Puts a claimed message back in the queue for another attempt after `delayMs`. */
export async function markMailRetry(id: string, claimId: string, error: string, delayMs: number): Promise<boolean> {
	const [, count] = await sequelize.query(
		`UPDATE mail_outbox SET status = 'queued', locked_until = NULL, last_error = :error, updated_at = now(),
		        next_attempt_at = now() + (:delayMs * interval '1 millisecond')
		 WHERE id = :id AND claim_id = :claimId AND status = 'sending'`,
		{ type: QueryTypes.UPDATE, replacements: { id, claimId, error: error.slice(0, 2000), delayMs } }
	);
	return count > 0;
}

/** Gives up on a claimed message (permanent refusal or attempts used up). */
export async function markMailFailed(id: string, claimId: string, error: string): Promise<boolean> {
	const [, count] = await sequelize.query(
		`UPDATE mail_outbox SET status = 'failed', locked_until = NULL, last_error = :error, updated_at = now()
		 WHERE id = :id AND claim_id = :claimId AND status = 'sending'`,
		{ type: QueryTypes.UPDATE, replacements: { id, claimId, error: error.slice(0, 2000) } }
	);
	return count > 0;
}

/** Queues a failed message again from scratch (an admin's "send again"). */
export async function requeueFailedMail(id: string): Promise<boolean> {
	const [, count] = await sequelize.query(
		`UPDATE mail_outbox SET status = 'queued', attempts = 0, next_attempt_at = now(), updated_at = now()
		 WHERE id = :id AND status = 'failed'`,
		{ type: QueryTypes.UPDATE, replacements: { id } }
	);
	return count > 0;
}

export interface OutboxRow {
	id: string;
	kind: MailKind;
	toAddress: string;
	subject: string;
	status: OutboxStatus;
	attempts: number;
	lastError: string | null;
	createdAt: string;
	nextAttemptAt: string;
	sentAt: string | null;
	relatedType: string | null;
	relatedId: string | null;
}

const OUTBOX_COLUMNS = `id, kind, to_address, subject, status, attempts, last_error, created_at, next_attempt_at, sent_at, related_type, related_id`;

function toOutboxRow(r: Record<string, unknown>): OutboxRow {
	const iso = (v: unknown) => (v ? new Date(v as string).toISOString() : null);
	return {
		id: r.id as string,
		kind: r.kind as MailKind,
		toAddress: r.to_address as string,
		subject: r.subject as string,
		status: r.status as OutboxStatus,
		attempts: Number(r.attempts),
		lastError: (r.last_error as string | null) ?? null,
		createdAt: iso(r.created_at)!,
		nextAttemptAt: iso(r.next_attempt_at)!,
		sentAt: iso(r.sent_at),
		relatedType: (r.related_type as string | null) ?? null,
		relatedId: (r.related_id as string | null) ?? null
	};
}

/** Messages about one record (e.g. a quote), oldest first: the delivery trail. */
export async function listOutboxFor(relatedType: string, relatedId: string): Promise<OutboxRow[]> {
	const rows = await sequelize.query<Record<string, unknown>>(
		`SELECT ${OUTBOX_COLUMNS} FROM mail_outbox WHERE related_type = :relatedType AND related_id = :relatedId ORDER BY created_at, id`,
		{ type: QueryTypes.SELECT, replacements: { relatedType, relatedId } }
	);
	return rows.map(toOutboxRow);
}

/** Messages not (yet) delivered, newest first, and how many there are in each state. */
export async function outboxOverview(limit = 50): Promise<{ counts: Record<OutboxStatus, number>; pending: OutboxRow[] }> {
	const [countRows, pending] = await Promise.all([
		sequelize.query<{ status: OutboxStatus; n: string }>(`SELECT status, count(*) AS n FROM mail_outbox GROUP BY status`, {
			type: QueryTypes.SELECT
		}),
		sequelize.query<Record<string, unknown>>(
			`SELECT ${OUTBOX_COLUMNS} FROM mail_outbox WHERE status <> 'sent' ORDER BY created_at DESC LIMIT :limit`,
			{ type: QueryTypes.SELECT, replacements: { limit } }
		)
	]);
	const counts: Record<OutboxStatus, number> = { queued: 0, sending: 0, sent: 0, failed: 0 };
	for (const row of countRows) counts[row.status] = Number(row.n);
	return { counts, pending: pending.map(toOutboxRow) };
}

/** One message's state, or null. */
export async function getOutboxMail(id: string): Promise<OutboxRow | null> {
	const [row] = await sequelize.query<Record<string, unknown>>(`SELECT ${OUTBOX_COLUMNS} FROM mail_outbox WHERE id = :id`, {
		type: QueryTypes.SELECT,
		replacements: { id }
	});
	return row ? toOutboxRow(row) : null;
}
