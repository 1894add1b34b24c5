import { hash, verify } from '@node-rs/argon2';

/** `Algorithm.Argon2id` of @node-rs/argon2 (an ambient const enum, so spelled out here). */
const ARGON2ID = 2;

/** Argon2id with m = 19 456 KiB, t = 2, p = 1 — OWASP Password Storage Cheat Sheet. */
export const ARGON2_OPTIONS = {
	algorithm: ARGON2ID,
	memoryCost: 19_456,
	timeCost: 2,
	parallelism: 1,
	outputLen: 32
} as const;

export function hashPassword(password: string): Promise<string> {
	return hash(password, ARGON2_OPTIONS);
}

export async function verifyPassword(stored: string, password: string): Promise<boolean> {
	try {
		return await verify(stored, password);
	} catch {
		return false;
	}
}

/** A hash of a random password, verified against when the e-mail is unknown so timing reveals nothing. */
let dummyHash: Promise<string> | null = null;
export function dummyPasswordHash(): Promise<string> {
	dummyHash ??= hashPassword('not-a-real-password-' + Math.random());
	return dummyHash;
}
