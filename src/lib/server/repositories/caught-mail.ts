import { createHash } from 'node:crypto';
import { QueryTypes } from 'sequelize';
import { sequelize } from '../db';
import { CaughtMail, CaughtMailAttachment, type CaughtHeader } from '../db/models/delivery';

export interface CaughtMailInput {
	envelopeFrom: string | null;
	envelopeTo: string[];
	fromAddress: string | null;
	toAddress: string | null;
	cc: string | null;
	replyTo: string | null;
	subject: string | null;
	messageId: string | null;
	sentAt: Date | null;
	headers: CaughtHeader[];
	text: string | null;
	html: string | null;
	raw: Buffer;
	attachments: {
		filename: string | null;
		contentType: string;
		contentId: string | null;
		content: Buffer;
	}[];
}

/** Stores one received message and its attachments in one transaction; returns its id. */
export async function saveCaughtMail(input: CaughtMailInput): Promise<string> {
	return sequelize.transaction(async (transaction) => {
		const mail = await CaughtMail.create(
			{
				envelopeFrom: input.envelopeFrom,
				envelopeTo: input.envelopeTo,
				fromAddress: input.fromAddress,
				toAddress: input.toAddress,
				cc: input.cc,
				replyTo: input.replyTo,
				subject: input.subject,
				messageId: input.messageId,
				sentAt: input.sentAt,
				headers: input.headers,
				text: input.text,
				html: input.html,
				sizeBytes: input.raw.length,
				raw: input.raw
			},
			{ transaction }
		);
		if (input.attachments.length > 0) {
			await CaughtMailAttachment.bulkCreate(
				input.attachments.map((a, position) => ({
					caughtMailId: mail.id,
					position,
					filename: a.filename,
					contentType: a.contentType,
					contentId: a.contentId,
					sizeBytes: a.content.length,
					checksumSha256: createHash('sha256').update(a.content).digest('hex'),
					content: a.content
				})),
				{ transaction }
			);
		}
		return mail.id;
	});
}

export interface CaughtMailSummary {
	id: string;
	receivedAt: string;
	from: string | null;
	to: string;
	subject: string | null;
	sizeBytes: number;
	attachmentCount: number;
}

/** A page of caught mail, newest first, without bodies or bytes. */
export async function listCaughtMail(page: number, pageSize: number): Promise<{ rows: CaughtMailSummary[]; total: number }> {
	const [rows, [{ n }]] = await Promise.all([
		sequelize.query<Record<string, unknown>>(
			`SELECT m.id, m.received_at, m.from_address, m.to_address, m.envelope_to, m.subject, m.size_bytes,
			        (SELECT count(*) FROM caught_mail_attachments a WHERE a.caught_mail_id = m.id) AS attachment_count
			 FROM caught_mail m ORDER BY m.received_at DESC, m.id DESC LIMIT :limit OFFSET :offset`,
			{ type: QueryTypes.SELECT, replacements: { limit: pageSize, offset: (page - 1) * pageSize } }
		),
		sequelize.query<{ n: string }>(`SELECT count(*) AS n FROM caught_mail`, { type: QueryTypes.SELECT })
	]);
	return {
		total: Number(n),
		rows: rows.map((r) => ({
			id: r.id as string,
			receivedAt: new Date(r.received_at as string).toISOString(),
			from: (r.from_address as string | null) ?? null,
			to: (r.to_address as string | null) ?? ((r.envelope_to as string[]) ?? []).join(', '),
			subject: (r.subject as string | null) ?? null,
			sizeBytes: Number(r.size_bytes),
			attachmentCount: Number(r.attachment_count)
		}))
	};
}

export interface CaughtMailDetail {
	id: string;
	receivedAt: string;
	envelopeFrom: string | null;
	envelopeTo: string[];
	from: string | null;
	to: string | null;
	cc: string | null;
	replyTo: string | null;
	subject: string | null;
	messageId: string | null;
	sentAt: string | null;
	headers: CaughtHeader[];
	text: string | null;
	hasHtml: boolean;
	sizeBytes: number;
	attachments: { id: string; filename: string | null; contentType: string; sizeBytes: number; checksumSha256: string }[];
}

/** One caught message without its raw source, HTML or attachment bytes; null when unknown. */
export async function getCaughtMail(id: string): Promise<CaughtMailDetail | null> {
	const mail = await CaughtMail.findByPk(id, { attributes: { exclude: ['raw'] } });
	if (!mail) return null;
	const attachments = await CaughtMailAttachment.findAll({
		where: { caughtMailId: id },
		attributes: ['id', 'filename', 'contentType', 'sizeBytes', 'checksumSha256'],
		order: [['position', 'ASC']]
	});
	return {
		id: mail.id,
		receivedAt: mail.receivedAt.toISOString(),
		envelopeFrom: mail.envelopeFrom,
		envelopeTo: mail.envelopeTo,
		from: mail.fromAddress,
		to: mail.toAddress,
		cc: mail.cc,
		replyTo: mail.replyTo,
		subject: mail.subject,
		messageId: mail.messageId,
		sentAt: mail.sentAt ? mail.sentAt.toISOString() : null,
		headers: mail.headers,
		text: mail.text,
		hasHtml: !!mail.html,
		sizeBytes: mail.sizeBytes,
		attachments: attachments.map((a) => ({
			id: a.id,
			filename: a.filename,
			contentType: a.contentType,
			sizeBytes: a.sizeBytes,
			checksumSha256: a.checksumSha256
		}))
	};
}

/** The HTML part of a caught message: undefined when the message is unknown, null when it has none. */
export async function getCaughtMailHtml(id: string): Promise<string | null | undefined> {
	const mail = await CaughtMail.findByPk(id, { attributes: ['id', 'html'] });
	return mail ? mail.html : undefined;
}

/** One attachment's bytes, only when it belongs to that message. */
export async function getCaughtAttachment(
	mailId: string,
	attachmentId: string
): Promise<{ filename: string | null; contentType: string; content: Buffer } | null> {
	const a = await CaughtMailAttachment.findOne({ where: { id: attachmentId, caughtMailId: mailId } });
	return a ? { filename: a.filename, contentType: a.contentType, content: a.content } : null;
}
