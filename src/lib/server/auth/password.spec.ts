import { describe, expect, it } from 'vitest';
import { hashPassword, verifyPassword } from './password';

describe('password hashing', () => {
	it('round-trips and refuses a wrong password', async () => {
		const stored = await hashPassword('traywise-demo');
		expect(await verifyPassword(stored, 'traywise-demo')).toBe(true);
		expect(await verifyPassword(stored, 'traywise-dem0')).toBe(false);
	});

	it('uses Argon2id with m=19456 KiB, t=2, p=1 (OWASP Password Storage Cheat Sheet)', async () => {
		const stored = await hashPassword('x');
		// PHC string format: $argon2id$v=19$m=19456,t=2,p=1$salt$hash
		expect(stored).toMatch(/^\$argon2id\$v=19\$m=19456,t=2,p=1\$/);
	});

	it('salts every hash', async () => {
		expect(await hashPassword('same')).not.toBe(await hashPassword('same'));
	});

	it('treats a malformed stored hash as a mismatch, not a crash', async () => {
		expect(await verifyPassword('not-a-hash', 'x')).toBe(false);
	});
});
