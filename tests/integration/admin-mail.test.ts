import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sequelize } from '$lib/server/db';
import { CaughtMail, CaughtMailAttachment, MailOutbox } from '$lib/server/db/models/delivery';
import { enqueueMail } from '$lib/server/email/outbox';
import { DEMO, client, signIn, type Client } from '../helpers/http';
import { waitFor } from '../helpers/services';

let admin: Client;
let rep: Client;
let mailId: string;
let attachmentId: string;
const marker = randomUUID().slice(0, 8);
const subject = `Caught mail check ${marker}`;
const attachmentBytes = Buffer.from([0x25, 0x50, 0x44, 0x46, 0x2d, 0x00, 0xff, 0x10, 0x80, 0x7f]);

beforeAll(async () => {
	admin = await signIn(DEMO.admin);
	rep = await signIn(DEMO.rep);
	const { id } = await enqueueMail({
		kind: 'test',
		to: 'viewer@customer.test',
		subject,
		text: `Plain part ${marker}`,
		html: `<p id="body">HTML part ${marker}</p><script>parent.document.title = 'pwned'</script>`,
		attachments: [{ filename: 'price sheet.pdf', contentType: 'application/pdf', content: attachmentBytes }]
	});
	const sent = await waitFor('delivery', async () => {
		const r = await MailOutbox.findByPk(id);
		return r?.status === 'sent' ? r : null;
	});
	const caught = await waitFor('caught', () => CaughtMail.findOne({ where: { messageId: sent.messageId } }));
	mailId = caught.id;
	attachmentId = (await CaughtMailAttachment.findOne({ where: { caughtMailId: mailId } }))!.id;
});

afterAll(async () => {
	await sequelize.close();
});

describe('admin caught-mail pages', () => {
	it('lists the caught message, newest first, for an admin', async () => {
		const res = await admin.get('/admin/mail');
		expect(res.status).toBe(200);
		const html = await res.text();
		expect(html).toContain(subject);
		expect(html).toContain(`href="/admin/mail/${mailId}"`);
		// newest first: this message appears before any older one in the table
		const first = /href="\/admin\/mail\/([0-9a-f-]{36})"/.exec(html);
		expect(first?.[1]).toBe(mailId);
	});

	it('shows headers, the text part, a sandboxed frame for the HTML part and the attachment', async () => {
		const res = await admin.get(`/admin/mail/${mailId}`);
		expect(res.status).toBe(200);
		const html = await res.text();
		expect(html).toContain('viewer@customer.test');
		expect(html).toContain(`Plain part ${marker}`);
		expect(html).toMatch(new RegExp(`<iframe[^>]*src="/admin/mail/${mailId}/html"[^>]*sandbox=""`));
		expect(html).toContain(`/admin/mail/${mailId}/attachments/${attachmentId}`);
		expect(html).toContain('price sheet.pdf');
		// the message's own HTML never reaches our page
		expect(html).not.toContain('pwned');
	});

	it('serves the HTML part with a CSP that forbids scripts and only lets our own pages frame it', async () => {
		const res = await admin.get(`/admin/mail/${mailId}/html`);
		expect(res.status).toBe(200);
		const csp = res.headers.get('content-security-policy') ?? '';
		expect(csp).toContain("default-src 'none'");
		expect(csp).not.toContain('script-src');
		expect(csp).toContain("frame-ancestors 'self'");
		expect(csp).toMatch(/(^|; )sandbox($|;)/);
		expect(res.headers.get('x-frame-options')).toBe('SAMEORIGIN');
		expect(await res.text()).toContain(`HTML part ${marker}`);
	});

	it('downloads the attachment byte for byte, as a download', async () => {
		const res = await admin.get(`/admin/mail/${mailId}/attachments/${attachmentId}`);
		expect(res.status).toBe(200);
		expect(res.headers.get('content-disposition')).toBe(
			`attachment; filename="price sheet.pdf"; filename*=UTF-8''price%20sheet.pdf`
		);
		expect(Buffer.from(await res.arrayBuffer()).equals(attachmentBytes)).toBe(true);
	});

	it('answers unknown and malformed ids with 404, not an error', async () => {
		for (const path of [
			`/admin/mail/${randomUUID()}`,
			'/admin/mail/not-a-uuid',
			`/admin/mail/${randomUUID()}/html`,
			`/admin/mail/${mailId}/attachments/${randomUUID()}`,
			`/admin/mail/${mailId}/attachments/..%2F..%2Fetc`
		]) {
			expect((await admin.get(path)).status, path).toBe(404);
		}
		expect((await admin.get('/admin/mail?page=-3')).status).toBe(200);
		expect((await admin.get('/admin/mail?page=abc')).status).toBe(200);
	});

	it('refuses a rep (403) on the list, the message, its HTML and its attachment', async () => {
		for (const path of [
			'/admin/mail',
			`/admin/mail/${mailId}`,
			`/admin/mail/${mailId}/html`,
			`/admin/mail/${mailId}/attachments/${attachmentId}`
		]) {
			const res = await rep.get(path);
			expect(res.status, path).toBe(403);
			expect(await res.text(), path).not.toContain(marker);
		}
	});

	it('sends a signed-out visitor to sign in', async () => {
		const res = await client().get(`/admin/mail/${mailId}/html`);
		expect(res.status).toBe(303);
		expect(res.headers.get('location')).toMatch(/^\/login/);
	});

	it('refuses a rep the "send again" action and answers a bad id with 400', async () => {
		expect((await rep.action('/admin/mail?/requeue', { id: mailId })).status).toBe(403);
		expect((await admin.action('/admin/mail?/requeue', { id: 'nope' })).status).toBe(400);
		expect((await admin.action('/admin/mail?/requeue', { id: randomUUID() })).status).toBe(409);
	});

	it('lets an admin send a failed message again, and it is delivered', async () => {
		const { id } = await enqueueMail({ kind: 'test', to: 'retry@customer.test', subject: `Retry ${marker}`, text: 'again' });
		await waitFor('first delivery', async () => (await MailOutbox.findByPk(id))?.status === 'sent');
		// as if the relay had refused it for good
		await MailOutbox.update({ status: 'failed', lastError: '550 mailbox unavailable', sentAt: null }, { where: { id } });
		const page = await (await admin.get('/admin/mail')).text();
		expect(page).toContain('550 mailbox unavailable');
		const res = await admin.action('/admin/mail?/requeue', { id });
		expect(res.status).toBe(200);
		const row = await waitFor('second delivery', async () => {
			const r = await MailOutbox.findByPk(id);
			return r?.status === 'sent' ? r : null;
		});
		expect(row.attempts).toBe(1);
		expect(await CaughtMail.count({ where: { messageId: row.messageId } })).toBe(2);
	});
});
