import { QueryTypes } from 'sequelize';
import { sequelize } from '../db';
import { config } from '../config';
import { enqueueBuiltMail } from '../email/outbox';
import { passwordReset } from '../email/messages';
import { newToken, tokenHash } from '../quotes/customer-links';
import { changePassword } from '../repositories/users';
import { signInThrottle } from './throttle';

/** minutes a reset link works */
export const RESET_MINUTES = 30;

/**
 * Queues a reset link for an active account with this e-mail. Says nothing about whether the
 * account exists (the caller shows the same message either way); at most a few requests per
 * address per quarter hour, counted in PostgreSQL.
 */
export async function requestPasswordReset(email: string): Promise<void> {
	const key = `reset:${email.trim().toLowerCase()}`;
	if ((await signInThrottle.retryAfterMinutes([key])) > 0) return;
	await signInThrottle.recordFailure([key]);
	const users = await sequelize.query<{ id: string; name: string; email: string }>(
		`SELECT id, name, email FROM users WHERE lower(email) = lower(:email) AND active`,
		{ replacements: { email: email.trim() }, type: QueryTypes.SELECT }
	);
	const user = users[0];
	if (!user) return;
	const token = newToken();
	await sequelize.transaction(async (t) => {
		await sequelize.query(
			`INSERT INTO password_resets (user_id, token_hash, expires_at) VALUES (:userId, :hash, now() + make_interval(mins => :minutes))`,
			{ replacements: { userId: user.id, hash: tokenHash(token), minutes: RESET_MINUTES }, transaction: t }
		);
		await enqueueBuiltMail(
			'password-reset',
			user.email,
			passwordReset({ userName: user.name, link: `${config.publicUrl.replace(/\/$/, '')}/reset-password/${token}`, expiresInMinutes: RESET_MINUTES }),
			{ related: { type: 'user', id: user.id } },
			{ transaction: t }
		);
	});
}

/** The user a live, unused reset token belongs to, or null. */
export async function resetTokenUser(token: string): Promise<string | null> {
	if (!/^[A-Za-z0-9_-]{43}$/.test(token)) return null;
	const rows = await sequelize.query<{ user_id: string }>(
		`SELECT r.user_id FROM password_resets r JOIN users u ON u.id = r.user_id
		 WHERE r.token_hash = :hash AND r.used_at IS NULL AND r.expires_at > now() AND u.active`,
		{ replacements: { hash: tokenHash(token) }, type: QueryTypes.SELECT }
	);
	return rows[0]?.user_id ?? null;
}

/** Sets the new password once per token and ends every session of the user. */
export async function completePasswordReset(token: string, password: string): Promise<boolean> {
	const [rows] = (await sequelize.query(
		`UPDATE password_resets SET used_at = now()
		 WHERE token_hash = :hash AND used_at IS NULL AND expires_at > now() RETURNING user_id`,
		{ replacements: { hash: tokenHash(token) } }
	)) as [{ user_id: string }[], unknown];
	const userId = rows[0]?.user_id;
	if (!userId) return false;
	await changePassword(userId, password);
	return true;
}
