import { randomUUID } from 'node:crypto';
import PDFDocument from 'pdfkit';
import { simpleParser } from 'mailparser';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sequelize } from '$lib/server/db';
import { CaughtMail, MailOutbox } from '$lib/server/db/models/delivery';
import { InvalidMailError, enqueueBuiltMail, enqueueMail, mailTrail } from '$lib/server/email/outbox';
import { quoteToCustomer } from '$lib/server/email/messages';
import { startMailWorker } from '$lib/server/email/worker';
import { closeMailTransport } from '$lib/server/email/transport';
import { services, sleep, waitFor } from '../helpers/services';

function pdf(text: string): Promise<Buffer> {
	return new Promise((resolve) => {
		const doc = new PDFDocument({ size: 'A4' });
		const chunks: Buffer[] = [];
		doc.on('data', (c: Buffer) => chunks.push(c));
		doc.on('end', () => resolve(Buffer.concat(chunks)));
		doc.text(text);
		doc.end();
	});
}

function quoteMail(pdfBytes: Buffer, quoteNumber: string) {
	return quoteToCustomer({
		dealerName: 'Northgate Lift Service',
		quoteNumber,
		revision: 1,
		customerName: 'Harbour Cold Store',
		contactName: 'Dana Example',
		repName: 'Robin Rep',
		repEmail: 'rep@demo.traywise.test',
		totalCents: 4_812_350,
		depositCents: 962_470,
		currency: 'EUR',
		validUntil: '2026-09-30',
		link: `http://127.0.0.1:4173/q/${randomUUID()}`,
		pdf: { filename: `${quoteNumber}.pdf`, content: pdfBytes }
	});
}

const caughtCount = (messageId: string) => CaughtMail.count({ where: { messageId } });

beforeAll(async () => {
	expect((await services.status()).smtp).toBe('running');
});

afterAll(async () => {
	// never leave the catcher down for the next test file
	await services.startSmtp();
	closeMailTransport();
	await sequelize.close();
});

describe('mail outbox over real SMTP', () => {
	it('queues a message while the SMTP catcher is down and delivers it exactly once after it returns', async () => {
		const pdfBytes = await pdf('Quote Q-OUTAGE-1 — deposit 9,624.70 EUR');
		const message = quoteMail(pdfBytes, 'Q-OUTAGE-1');
		const quoteId = randomUUID();

		await services.stopSmtp();
		try {
			const { id, created } = await enqueueBuiltMail('quote-to-customer', 'dana@customer.test', message, {
				related: { type: 'quote', id: quoteId }
			});
			expect(created).toBe(true);
			const row = await MailOutbox.findByPk(id);
			expect(row).not.toBeNull();

			// the app's worker tries, fails to connect, and keeps the message queued with its reason
			const waiting = await waitFor('two failed attempts', async () => {
				const r = await MailOutbox.findByPk(id);
				return r && r.attempts >= 2 && r.status === 'queued' ? r : null;
			});
			expect(waiting.lastError).toMatch(/ECONNREFUSED/);
			expect(waiting.sentAt).toBeNull();
			expect(await caughtCount(row!.messageId)).toBe(0);
			const trail = await mailTrail({ type: 'quote', id: quoteId });
			expect(trail.map((t) => t.status)).toEqual(['queued']);
		} finally {
			await services.startSmtp();
		}

		const sent = await waitFor('delivery after the catcher returns', async () => {
			const r = await MailOutbox.findOne({ where: { relatedId: quoteId } });
			return r?.status === 'sent' ? r : null;
		});
		expect(sent.sentAt).not.toBeNull();
		expect(await caughtCount(sent.messageId)).toBe(1);
		// several poll intervals later it is still there once: marked sent, never picked up again
		await sleep(2_500);
		expect(await caughtCount(sent.messageId)).toBe(1);
		expect((await MailOutbox.findByPk(sent.id))!.status).toBe('sent');

		// what the recipient got, parsed back from the raw SMTP data
		const caught = await CaughtMail.findOne({ where: { messageId: sent.messageId } });
		const parsed = await simpleParser(caught!.raw);
		expect(parsed.subject).toBe('Your quote Q-OUTAGE-1 from Northgate Lift Service');
		expect(parsed.text).toContain('€48,123.50');
		expect(parsed.text).toContain('http://127.0.0.1:4173/q/');
		expect(parsed.html).toContain('Open your quote');
		expect(parsed.attachments).toHaveLength(1);
		const [attachment] = parsed.attachments;
		expect(attachment.filename).toBe('Q-OUTAGE-1.pdf');
		expect(attachment.contentType).toBe('application/pdf');
		expect(attachment.content.subarray(0, 5).toString()).toBe('%PDF-');
		expect(attachment.content.equals(pdfBytes)).toBe(true);
	});

	it('keeps a message enqueued inside a rolled-back transaction out of the outbox', async () => {
		const dedupeKey = `rollback:${randomUUID()}`;
		await expect(
			sequelize.transaction(async (transaction) => {
				await enqueueMail(
					{ kind: 'test', to: 'nobody@customer.test', subject: 'Never sent', text: 'rolled back', dedupeKey },
					{ transaction }
				);
				throw new Error('the quote change failed');
			})
		).rejects.toThrow('the quote change failed');
		expect(await MailOutbox.count({ where: { dedupeKey } })).toBe(0);
	});

	it('sends a message enqueued inside a committed transaction', async () => {
		const dedupeKey = `commit:${randomUUID()}`;
		await sequelize.transaction(async (transaction) => {
			await enqueueMail({ kind: 'test', to: 'kept@customer.test', subject: 'Committed', text: 'with its change', dedupeKey }, { transaction });
		});
		const sent = await waitFor('delivery', async () => {
			const r = await MailOutbox.findOne({ where: { dedupeKey } });
			return r?.status === 'sent' ? r : null;
		});
		expect(await caughtCount(sent.messageId)).toBe(1);
	});

	it('adds nothing for a dedupe key already queued', async () => {
		const dedupeKey = `quote-sent:${randomUUID()}:dana@customer.test`;
		const first = await enqueueMail({ kind: 'test', to: 'dana@customer.test', subject: 'Once', text: 'one', dedupeKey });
		const second = await enqueueMail({ kind: 'test', to: 'dana@customer.test', subject: 'Once again', text: 'two', dedupeKey });
		expect(first.created).toBe(true);
		expect(second).toEqual({ id: first.id, created: false });
		expect(await MailOutbox.count({ where: { dedupeKey } })).toBe(1);
	});

	it('refuses an unusable address with a clear error and stores nothing', async () => {
		const dedupeKey = `bad:${randomUUID()}`;
		await expect(enqueueMail({ kind: 'test', to: 'not an address', subject: 'x', text: 'y', dedupeKey })).rejects.toThrow(
			InvalidMailError
		);
		await expect(
			enqueueMail({ kind: 'test', to: 'a@b.test\r\nBcc: victim@c.test', subject: 'x', text: 'y', dedupeKey })
		).rejects.toThrow(/not a usable e-mail address/);
		expect(await MailOutbox.count({ where: { dedupeKey } })).toBe(0);
	});

	it('lets several workers drain one outbox side by side without sending anything twice', async () => {
		const batch = randomUUID();
		// three extra workers in this process compete with the app's own worker (FOR UPDATE SKIP LOCKED)
		const workers = [1, 2, 3].map(() => startMailWorker({ pollMs: 50, batchSize: 2, log: () => {} }));
		try {
			const ids = await Promise.all(
				Array.from({ length: 24 }, (_, i) =>
					enqueueMail({ kind: 'test', to: `load-${i}@customer.test`, subject: `Load ${batch} #${i}`, text: `message ${i}` })
				)
			);
			await waitFor(
				'all 24 sent',
				async () => (await MailOutbox.count({ where: { id: ids.map((r) => r.id), status: 'sent' } })) === 24,
				30_000
			);
			const rows = await MailOutbox.findAll({ where: { id: ids.map((r) => r.id) } });
			const counts = await Promise.all(rows.map((r) => caughtCount(r.messageId)));
			expect(counts).toEqual(rows.map(() => 1));
			expect(rows.every((r) => r.attempts === 1)).toBe(true);
		} finally {
			await Promise.all(workers.map((w) => w.stop()));
		}
	});
});
