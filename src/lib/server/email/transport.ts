import nodemailer, { type Transporter } from 'nodemailer';
import type SMTPTransport from 'nodemailer/lib/smtp-transport';
import { config } from '../config';

let transport: Transporter<SMTPTransport.SentMessageInfo> | null = null;

/**
 * The one SMTP transport of the process, built on first use from SMTP_* settings. A connection
 * per message (no pool): a relay that restarts never leaves a dead pooled socket behind.
 * Short timeouts so a hung relay costs one retry, not a stuck worker.
 */
export function mailTransport(): Transporter<SMTPTransport.SentMessageInfo> {
	if (transport) return transport;
	const smtp = config.smtp;
	transport = nodemailer.createTransport({
		host: smtp.host,
		port: smtp.port,
		secure: smtp.secure,
		auth: smtp.user ? { user: smtp.user, pass: smtp.pass ?? '' } : undefined,
		connectionTimeout: 10_000,
		greetingTimeout: 10_000,
		socketTimeout: 30_000
	});
	return transport;
}

/** The From address of every message (MAIL_FROM). */
export function mailFrom(): string {
	return config.smtp.from;
}

/** Closes the transport (process shutdown, tests). */
export function closeMailTransport(): void {
	transport?.close();
	transport = null;
}
