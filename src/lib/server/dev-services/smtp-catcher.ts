/**
 * The local SMTP catcher: a real SMTP server (smtp-server) on 127.0.0.1 that accepts every message,
 * parses it (mailparser) and stores it in PostgreSQL (`caught_mail`), where the admin mail page
 * shows it. A stand-in for a relay on development and test machines; never started in production.
 */
import { SMTPServer, type SMTPServerDataStream, type SMTPServerSession } from 'smtp-server';
import { simpleParser, type AddressObject } from 'mailparser';
import { saveCaughtMail } from '../repositories/caught-mail';

export interface SmtpCatcherOptions {
	port: number;
	host?: string;
	/** larger messages are refused with 552, bytes */
	maxBytes?: number;
	log?: (message: string) => void;
}

export interface SmtpCatcher {
	readonly port: number;
	/** stops accepting connections and closes open ones within a second */
	stop(): Promise<void>;
}

function addressText(value: AddressObject | AddressObject[] | undefined): string | null {
	if (!value) return null;
	return [value].flat().map((a) => a.text).join(', ') || null;
}

async function readAll(stream: SMTPServerDataStream): Promise<Buffer> {
	const chunks: Buffer[] = [];
	for await (const chunk of stream) chunks.push(chunk as Buffer);
	return Buffer.concat(chunks);
}

/** Parses and stores one received message; throws when it cannot be stored. */
export async function catchMessage(raw: Buffer, session: Pick<SMTPServerSession, 'envelope'>): Promise<string> {
	const parsed = await simpleParser(raw, { skipImageLinks: true });
	const mailFrom = session.envelope.mailFrom;
	return saveCaughtMail({
		envelopeFrom: mailFrom ? mailFrom.address : null,
		envelopeTo: session.envelope.rcptTo.map((r) => r.address),
		fromAddress: addressText(parsed.from),
		toAddress: addressText(parsed.to),
		cc: addressText(parsed.cc),
		replyTo: addressText(parsed.replyTo),
		subject: parsed.subject ?? null,
		messageId: parsed.messageId ?? null,
		sentAt: parsed.date && !Number.isNaN(parsed.date.getTime()) ? parsed.date : null,
		headers: parsed.headerLines.map((h) => ({ key: h.key, value: h.line.slice(h.line.indexOf(':') + 1).trim() })),
		text: parsed.text ?? null,
		html: typeof parsed.html === 'string' ? parsed.html : null,
		raw,
		attachments: parsed.attachments.map((a) => ({
			filename: a.filename ?? null,
			contentType: a.contentType || 'application/octet-stream',
			contentId: a.cid ?? null,
			content: a.content
		}))
	});
}

/** Starts a catcher; resolves once it listens (rejects when the port is taken). */
export function startSmtpCatcher(options: SmtpCatcherOptions): Promise<SmtpCatcher> {
	const host = options.host ?? '127.0.0.1';
	const maxBytes = options.maxBytes ?? 25 * 1024 * 1024;
	const log = options.log ?? (() => {});

	const server = new SMTPServer({
		name: 'traywise-catcher.local',
		banner: 'Traywise local mail catcher',
		// plain SMTP on 127.0.0.1: no STARTTLS to fail on, any credentials accepted
		disabledCommands: ['STARTTLS'],
		authOptional: true,
		allowInsecureAuth: true,
		onAuth(auth, _session, callback) {
			callback(null, { user: auth.username ?? 'anyone' });
		},
		size: maxBytes,
		closeTimeout: 1_000,
		logger: false,
		onData(stream, session, callback) {
			readAll(stream)
				.then(async (raw) => {
					if (stream.sizeExceeded) {
						const err = Object.assign(new Error('Message exceeds the catcher size limit'), { responseCode: 552 });
						return callback(err);
					}
					const id = await catchMessage(raw, session);
					log(`caught ${id} for ${session.envelope.rcptTo.map((r) => r.address).join(', ')}`);
					callback();
				})
				.catch((err: Error) => {
					// storing failed (e.g. the database is restarting): a 4xx makes the sender retry later
					log(`could not store a message: ${err.message}`);
					callback(Object.assign(new Error('Cannot store the message right now, try again later'), { responseCode: 451 }));
				});
		}
	});

	return new Promise((resolve, reject) => {
		const onError = (err: Error) => reject(err);
		server.once('error', onError);
		server.listen(options.port, host, () => {
			server.off('error', onError);
			server.on('error', (err) => log(`smtp error: ${err.message}`));
			log(`SMTP catcher listening on ${host}:${options.port}`);
			resolve({
				port: options.port,
				stop: () =>
					new Promise<void>((done) => {
						server.close(() => {
							log(`SMTP catcher on ${host}:${options.port} stopped`);
							done();
						});
					})
			});
		});
	});
}
