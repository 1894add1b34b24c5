/**
 * The mail relay (scripts/test.sh's SMTP catcher) down for a full minute while messages are queued.
 * The app's own outbox worker keeps trying with back-off; nothing is given up, and once the relay
 * is back every message arrives exactly once, promptly (within the back-off cap and a poll).
 */
import { randomUUID } from 'node:crypto';
import { simpleParser } from 'mailparser';
import { Op } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { config } from '$lib/server/config';
import { sequelize } from '$lib/server/db';
import { CaughtMail, MailOutbox } from '$lib/server/db/models/delivery';
import { enqueueMail } from '$lib/server/email/outbox';
import { services, sleep, waitFor } from '../helpers/services';

/** "Down for a minute". */
const OUTAGE_MS = 60_000;

beforeAll(async () => {
	expect((await services.status()).smtp).toBe('running');
});

afterAll(async () => {
	// never leave the catcher down for the next test file
	await services.startSmtp();
	await sequelize.close();
});

describe('the SMTP relay down for a minute', () => {
	it('keeps every queued message, then delivers each exactly once soon after the relay returns', async () => {
		const batch = randomUUID();
		const attachment = Buffer.from(`%PDF-1.4\n% quote for outage batch ${batch}\n%%EOF\n`);
		const queue = (i: number) =>
			enqueueMail({
				kind: 'test',
				to: `outage-${i}@customer.test`,
				subject: `Relay outage ${batch} #${i}`,
				text: `Message ${i} of the relay outage test.`,
				html: `<p>Message <strong>${i}</strong> of the relay outage test.</p>`,
				attachments:
					i === 0
						? [{ filename: 'Q-OUTAGE.pdf', contentType: 'application/pdf', content: attachment }]
						: [],
				dedupeKey: `smtp-outage:${batch}:${i}`
			});
		const ofBatch = { subject: { [Op.like]: `Relay outage ${batch} #%` } };

		await services.stopSmtp();
		const downAt = Date.now();
		let upAt = 0;
		try {
			// three messages as the relay goes away …
			const first = await Promise.all([0, 1, 2].map(queue));
			expect(first.every((r) => r.created)).toBe(true);

			// … the worker tries, fails to connect, and keeps them queued with the reason
			const trying = await waitFor('failed attempts on all three', async () => {
				const rows = await MailOutbox.findAll({ where: { id: first.map((r) => r.id) } });
				return rows.length === 3 && rows.every((r) => r.attempts >= 2 && r.status === 'queued')
					? rows
					: null;
			});
			expect(trying.every((r) => /ECONNREFUSED/.test(r.lastError ?? ''))).toBe(true);

			// … two more half-way through, and a repeat of one (a double tap) that adds nothing
			await sleep(Math.max(0, downAt + OUTAGE_MS / 2 - Date.now()));
			const later = await Promise.all([3, 4].map(queue));
			expect(later.every((r) => r.created)).toBe(true);
			expect(await queue(3)).toEqual({ id: later[0].id, created: false });

			// until the minute is up: nothing delivered, nothing given up. A poll may catch a message
			// in the middle of an attempt ('sending': claimed, connecting); on a busy machine the
			// refused connection takes longer to come back, so that moment is wider. Only 'sent' or
			// 'failed' would be wrong here.
			while (Date.now() < downAt + OUTAGE_MS) {
				const rows = await MailOutbox.findAll({ where: ofBatch });
				expect(rows).toHaveLength(5);
				expect(
					rows
						.filter((r) => r.status !== 'queued' && r.status !== 'sending')
						.map((r) => `${r.subject}: ${r.status} after ${r.attempts} attempts`)
				).toEqual([]);
				expect(await CaughtMail.count({ where: ofBatch })).toBe(0);
				await sleep(Math.min(5_000, Math.max(0, downAt + OUTAGE_MS - Date.now())));
			}
		} finally {
			await services.startSmtp();
			upAt = Date.now();
		}
		expect(upAt - downAt).toBeGreaterThanOrEqual(OUTAGE_MS);
		const attemptsWhileDown = (await MailOutbox.findAll({ where: ofBatch })).map((r) => r.attempts);
		expect(Math.min(...attemptsWhileDown)).toBeGreaterThanOrEqual(2);

		// the next try of each message is at most one back-off cap away, plus one poll of the worker
		const bound = config.mail.retryMaxMs + config.mail.pollMs + 5_000;
		await waitFor(
			'all five sent',
			async () => (await MailOutbox.count({ where: { ...ofBatch, status: 'sent' } })) === 5,
			bound,
			50
		);
		const deliveredMs = Date.now() - upAt;
		console.log(
			`[smtp-outage] relay down ${upAt - downAt} ms; ${Math.max(...attemptsWhileDown)} attempts at most while down; all delivered ${deliveredMs} ms after it returned (bound ${bound} ms)`
		);

		const rows = await MailOutbox.findAll({ where: ofBatch, order: [['subject', 'ASC']] });
		expect(rows.map((r) => r.toAddress)).toEqual(
			[0, 1, 2, 3, 4].map((i) => `outage-${i}@customer.test`)
		);
		const countCaught = async () =>
			Promise.all(rows.map((r) => CaughtMail.count({ where: { messageId: r.messageId } })));
		expect(await countCaught()).toEqual([1, 1, 1, 1, 1]);
		expect(await CaughtMail.count({ where: ofBatch })).toBe(5);

		// several polls later still once each: marked sent, never picked up again
		await sleep(config.mail.pollMs * 3);
		expect(await countCaught()).toEqual([1, 1, 1, 1, 1]);
		expect((await MailOutbox.findAll({ where: ofBatch })).map((r) => r.status)).toEqual([
			'sent',
			'sent',
			'sent',
			'sent',
			'sent'
		]);

		// what arrived is the message that was queued, attachment and all
		const caught = await CaughtMail.findOne({ where: { messageId: rows[0].messageId } });
		const parsed = await simpleParser(caught!.raw);
		expect(parsed.subject).toBe(`Relay outage ${batch} #0`);
		expect(parsed.text).toContain('Message 0 of the relay outage test.');
		expect(parsed.attachments).toHaveLength(1);
		expect(parsed.attachments[0].filename).toBe('Q-OUTAGE.pdf');
		expect(parsed.attachments[0].content.equals(attachment)).toBe(true);
	}, 120_000);
});
