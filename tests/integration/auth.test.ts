import { afterAll, describe, expect, it } from 'vitest';
import { BASE, DEMO, client, signIn, signInCookie, uniqueEmail } from '../helpers/http';
import { sequelize } from '$lib/server/db';
import { Session, User } from '$lib/server/db/models';
import { hashToken } from '$lib/server/auth/lucia';
import { createUser, updateUser } from '$lib/server/repositories/users';

afterAll(async () => {
	await sequelize.close();
});

describe('sign-in', () => {
	it('signs a demo rep in with an httpOnly, sameSite=lax cookie and sends them to their start page', async () => {
		const res = await client().action('/login', { email: DEMO.rep, password: 'traywise-demo' });
		expect(res.status).toBe(303);
		expect(res.headers.get('location')).toBe('/surveys');
		const cookie = res.headers.getSetCookie().find((c) => c.startsWith('traywise_session='))!;
		expect(cookie).toMatch(/HttpOnly/i);
		expect(cookie).toMatch(/SameSite=Lax/i);
	});

	it('stores only a hash of the session token', async () => {
		const cookie = (await signInCookie(DEMO.manager))!;
		const token = cookie.split('=')[1];
		expect(await Session.findByPk(token)).toBeNull();
		expect(await Session.findByPk(hashToken(token))).not.toBeNull();
	});

	it('gives a wrong password and an unknown e-mail the same message, and no cookie', async () => {
		const wrong = await client().action('/login', { email: DEMO.rep, password: 'not-the-password' });
		const unknown = await client().action('/login', { email: 'nobody@nowhere.test', password: 'not-the-password' });
		for (const res of [wrong, unknown]) {
			expect(res.status).toBe(400);
			expect(res.headers.getSetCookie().some((c) => c.startsWith('traywise_session=') && !c.includes('Max-Age=0'))).toBe(false);
			expect(await res.text()).toContain('That e-mail and password do not match an active account.');
		}
	});

	it('answers an empty form with field errors, not a crash', async () => {
		const res = await client().action('/login', { email: '', password: '' });
		expect(res.status).toBe(400);
		const html = await res.text();
		expect(html).toContain('Enter your e-mail address.');
		expect(html).toContain('Enter your password.');
	});
});

describe('sessions', () => {
	it('an expired session sends the visitor back to /login', async () => {
		const cookie = (await signInCookie(DEMO.rep))!;
		const c = client(cookie);
		expect((await c.get('/account')).status).toBe(200);
		await Session.update({ expiresAt: new Date(Date.now() - 1000) }, { where: { id: hashToken(cookie.split('=')[1]) } });
		const res = await c.get('/account');
		expect(res.status).toBe(303);
		expect(res.headers.get('location')).toMatch(/^\/login/);
	});

	it('signing out ends the session', async () => {
		const c = await signIn(DEMO.rep);
		expect((await c.action('/logout', {})).status).toBe(303);
		expect((await c.get('/account')).status).toBe(303);
	});
});

describe('deactivated users', () => {
	it('cannot sign in, and their open sessions stop working', async () => {
		const email = uniqueEmail('leaver');
		const id = await createUser({ name: 'Leaver', email, role: 'rep', teamId: null, password: 'a-long-password-1' });
		const c = await signIn(email, 'a-long-password-1');
		expect((await c.get('/account')).status).toBe(200);

		await updateUser({ id, role: 'rep', teamId: null, active: false });
		expect((await c.get('/account')).status).toBe(303);
		expect(await signInCookie(email, 'a-long-password-1')).toBeNull();
		const user = await User.findByPk(id);
		expect(user?.active).toBe(false);
	});

	it('an admin deactivates a user through the users page', async () => {
		const email = uniqueEmail('via-admin');
		const id = await createUser({ name: 'Via Admin', email, role: 'rep', teamId: null, password: 'a-long-password-2' });
		const victim = await signIn(email, 'a-long-password-2');
		const admin = await signIn(DEMO.admin);
		const res = await admin.action('/admin/users?/update', { id, role: 'rep', teamId: '' });
		expect(res.status).toBe(200);
		expect((await User.findByPk(id))?.active).toBe(false);
		expect((await victim.get('/account')).status).toBe(303);
	});
});

describe('roles', () => {
	it('refuses a rep on admin pages (403)', async () => {
		const rep = await signIn(DEMO.rep);
		for (const path of ['/admin/users', '/admin/catalogue', '/admin/price-book', '/admin/settings', '/admin/mail']) {
			expect((await rep.get(path)).status, path).toBe(403);
		}
	});

	it('refuses a rep on admin API routes with a JSON 403', async () => {
		const rep = await signIn(DEMO.rep);
		const res = await rep.get('/api/v1/admin/users', { headers: { accept: 'application/json' } });
		expect(res.status).toBe(403);
		expect(res.headers.get('content-type')).toContain('application/json');
	});

	it('refuses a rep the admin actions, and changes nothing', async () => {
		const rep = await signIn(DEMO.rep);
		const before = await User.count();
		const res = await rep.action('/admin/users?/create', {
			name: 'Sneaky',
			email: uniqueEmail('sneaky'),
			role: 'admin',
			password: 'a-long-password-3'
		});
		expect(res.status).toBe(403);
		expect(await User.count()).toBe(before);
	});

	it('answers a name that is too long with a plain message, and creates no one', async () => {
		const admin = await signIn(DEMO.admin);
		const before = await User.count();
		const res = await admin.action('/admin/users?/create', {
			name: 'N'.repeat(121),
			email: uniqueEmail('long-name'),
			role: 'rep',
			password: 'a-long-password-4'
		});
		expect(res.status).toBe(400);
		const html = await res.text();
		expect(html).toContain('Keep this to 120 characters or fewer.');
		expect(html).not.toMatch(/Too big|expected string/);
		expect(await User.count()).toBe(before);
	});

	it('lets an admin read the user list without password hashes', async () => {
		const admin = await signIn(DEMO.admin);
		const res = await admin.get('/api/v1/admin/users');
		expect(res.status).toBe(200);
		const body = await res.json();
		expect(body.users.some((u: { email: string }) => u.email === DEMO.rep)).toBe(true);
		expect(JSON.stringify(body)).not.toContain('argon2');
	});

	it('sends signed-out visitors to /login, and answers APIs with JSON 401', async () => {
		for (const path of ['/surveys', '/quotes', '/pipeline', '/admin/users']) {
			const res = await client().get(path);
			expect(res.status, path).toBe(303);
			expect(res.headers.get('location')).toBe(`/login?next=${encodeURIComponent(path)}`);
		}
		const api = await client().get('/api/v1/admin/users', { headers: { accept: 'application/json' } });
		expect(api.status).toBe(401);
	});
});

describe('health', () => {
	it('reports the database', async () => {
		const res = await fetch(`${BASE}/api/health`);
		expect(res.status).toBe(200);
		expect(await res.json()).toEqual({ status: 'ok', db: 'ok' });
	});
});
