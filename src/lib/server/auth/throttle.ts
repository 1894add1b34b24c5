import { QueryTypes } from 'sequelize';
import { sequelize } from '../db';

/**
 * Sign-in throttling kept in PostgreSQL so every app process counts the same attempts.
 * Limits: 8 failures per e-mail and 40 per client address within 15 minutes.
 */
export const SIGN_IN_LIMITS = {
	windowMinutes: 15,
	perEmail: 8,
	perAddress: 40
} as const;

function limitFor(key: string): number {
	return key.startsWith('ip:') ? SIGN_IN_LIMITS.perAddress : SIGN_IN_LIMITS.perEmail;
}

export const signInThrottle = {
	/** Minutes to wait before another attempt, 0 when allowed. */
	async retryAfterMinutes(keys: string[]): Promise<number> {
		const rows = await sequelize.query<{ key: string; n: string; oldest: Date }>(
			`SELECT key, count(*) AS n, min(at) AS oldest FROM sign_in_failures
			 WHERE key IN (:keys) AND at > now() - make_interval(mins => :window)
			 GROUP BY key`,
			{ replacements: { keys, window: SIGN_IN_LIMITS.windowMinutes }, type: QueryTypes.SELECT }
		);
		let wait = 0;
		for (const row of rows) {
			if (Number(row.n) >= limitFor(row.key)) {
				const freeAt = new Date(row.oldest).getTime() + SIGN_IN_LIMITS.windowMinutes * 60_000;
				wait = Math.max(wait, Math.ceil((freeAt - Date.now()) / 60_000));
			}
		}
		return Math.max(0, wait);
	},
	async recordFailure(keys: string[]): Promise<void> {
		// one statement: records the failure and keeps the table small
		await sequelize.query(
			`WITH old AS (DELETE FROM sign_in_failures WHERE at < now() - make_interval(mins => :window * 4))
			 INSERT INTO sign_in_failures (key) SELECT unnest(ARRAY[:keys]::text[])`,
			{ replacements: { keys, window: SIGN_IN_LIMITS.windowMinutes } }
		);
	},
	async clear(key: string): Promise<void> {
		await sequelize.query(`DELETE FROM sign_in_failures WHERE key = :key`, { replacements: { key } });
	}
};
