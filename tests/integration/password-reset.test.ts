import { afterAll, describe, expect, it } from 'vitest';
import { QueryTypes } from 'sequelize';
import { simpleParser } from 'mailparser';
import { client, signIn, signInCookie, uniqueEmail } from '../helpers/http';
import { sequelize } from '$lib/server/db';
import { createUser } from '$lib/server/repositories/users';

afterAll(async () => {
	await sequelize.close();
});

async function caughtLink(email: string): Promise<string> {
	for (let i = 0; i < 100; i++) {
		const rows = await sequelize.query<{ raw: Buffer }>(`SELECT raw FROM caught_mail WHERE to_address ILIKE :e ORDER BY received_at DESC LIMIT 1`, {
			replacements: { e: `%${email}%` },
			type: QueryTypes.SELECT
		});
		if (rows[0]) {
			const parsed = await simpleParser(rows[0].raw);
			const m = /\/reset-password\/([A-Za-z0-9_-]{43})/.exec(parsed.text ?? '');
			if (m) return m[1];
		}
		await new Promise((r) => setTimeout(r, 200));
	}
	throw new Error('no reset mail arrived');
}

describe('password reset', () => {
	it('mails a one-time link; setting a password signs the user out everywhere; the old password stops working', async () => {
		const email = uniqueEmail('forgetful');
		await createUser({ name: 'Forgetful Rep', email, role: 'rep', teamId: null, password: 'the-old-password-1' });
		const session = await signIn(email, 'the-old-password-1');
		expect((await session.get('/account')).status).toBe(200);

		const asked = await client().action('/forgot-password', { email });
		expect(asked.status).toBe(200);
		expect(await asked.text()).toContain('If that address belongs to an active account');
		const token = await caughtLink(email);
		const [stored] = await sequelize.query<{ n: string }>(`SELECT count(*) AS n FROM password_resets WHERE token_hash = encode(sha256(:t::bytea), 'hex')`, {
			replacements: { t: token },
			type: QueryTypes.SELECT
		});
		expect(Number(stored.n)).toBe(1); // stored only as its hash

		expect((await client().action(`/reset-password/${token}`, { password: 'short', repeat: 'short' })).status).toBe(400);
		const done = await client().action(`/reset-password/${token}`, { password: 'a-brand-new-password', repeat: 'a-brand-new-password' });
		expect(done.status).toBe(303);
		expect(done.headers.get('location')).toBe('/login?reset=1');
		expect((await session.get('/account')).status).toBe(303);
		expect(await signInCookie(email, 'the-old-password-1')).toBeNull();
		expect(await signInCookie(email, 'a-brand-new-password')).not.toBeNull();
		// the link works once
		expect((await client().action(`/reset-password/${token}`, { password: 'another-new-password', repeat: 'another-new-password' })).status).toBe(410);
	});

	it('answers the same for an unknown address and sends nothing', async () => {
		const email = uniqueEmail('nobody');
		const res = await client().action('/forgot-password', { email });
		expect(res.status).toBe(200);
		expect(await res.text()).toContain('If that address belongs to an active account');
		const [row] = await sequelize.query<{ n: string }>(`SELECT count(*) AS n FROM mail_outbox WHERE to_address = :email`, {
			replacements: { email },
			type: QueryTypes.SELECT
		});
		expect(Number(row.n)).toBe(0);
	});
});
