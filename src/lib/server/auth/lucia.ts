import { createHash } from 'node:crypto';
import { Lucia, TimeSpan, type Adapter, type DatabaseSession, type DatabaseUser } from 'lucia';
import { Op } from 'sequelize';
import { Session, User } from '../db/models';
import { config } from '../config';

/** Sessions are stored by the SHA-256 of their token; the token itself lives only in the cookie. */
export function hashToken(token: string): string {
	return createHash('sha256').update(token).digest('hex');
}

function toDatabaseUser(user: User): DatabaseUser {
	return {
		id: user.id,
		attributes: {
			email: user.email,
			name: user.name,
			role: user.role,
			teamId: user.teamId ?? null,
			unitSystem: user.unitSystem,
			active: user.active
		}
	};
}

/** lucia 3's adapter interface, over the Sequelize models (no lucia-specific tables). */
class SequelizeAdapter implements Adapter {
	async getSessionAndUser(
		sessionId: string
	): Promise<[DatabaseSession | null, DatabaseUser | null]> {
		const session = await Session.findByPk(hashToken(sessionId));
		if (!session) return [null, null];
		const user = await User.findByPk(session.userId);
		if (!user || !user.active) return [null, null];
		return [
			{ id: sessionId, userId: session.userId, expiresAt: session.expiresAt, attributes: {} },
			toDatabaseUser(user)
		];
	}
	async getUserSessions(userId: string): Promise<DatabaseSession[]> {
		// Only hashes are stored, so the original ids cannot be returned; lucia uses this for listing only.
		const rows = await Session.findAll({ where: { userId } });
		return rows.map((s) => ({ id: s.id, userId: s.userId, expiresAt: s.expiresAt, attributes: {} }));
	}
	async setSession(session: DatabaseSession): Promise<void> {
		await Session.create({
			id: hashToken(session.id),
			userId: session.userId,
			expiresAt: session.expiresAt
		});
	}
	async updateSessionExpiration(sessionId: string, expiresAt: Date): Promise<void> {
		await Session.update({ expiresAt }, { where: { id: hashToken(sessionId) } });
	}
	async deleteSession(sessionId: string): Promise<void> {
		await Session.destroy({ where: { id: hashToken(sessionId) } });
	}
	async deleteUserSessions(userId: string): Promise<void> {
		await Session.destroy({ where: { userId } });
	}
	async deleteExpiredSessions(): Promise<void> {
		await Session.destroy({ where: { expiresAt: { [Op.lte]: new Date() } } });
	}
}

export const lucia = new Lucia(new SequelizeAdapter(), {
	sessionExpiresIn: new TimeSpan(12, 'h'),
	sessionCookie: {
		name: 'traywise_session',
		attributes: { secure: config.secureCookies, sameSite: 'lax', path: '/' }
	},
	getUserAttributes: (a) => ({
		email: a.email,
		name: a.name,
		role: a.role,
		teamId: a.teamId,
		unitSystem: a.unitSystem
	})
});

declare module 'lucia' {
	interface Register {
		Lucia: typeof lucia;
		DatabaseUserAttributes: {
			email: string;
			name: string;
			role: 'rep' | 'manager' | 'admin';
			teamId: string | null;
			unitSystem: 'metric' | 'imperial';
			active: boolean;
		};
	}
}
