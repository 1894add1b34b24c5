import { createHash } from 'node:crypto';
import { Lucia, TimeSpan, type Adapter, type DatabaseSession, type DatabaseUser } from 'lucia';
import { Op, QueryTypes } from 'sequelize';
import { sequelize } from '../db';
import { Session, type Role, type UnitSystem } from '../db/models';
import { config } from '../config';

/** Sessions are stored by the SHA-256 of their token; the token itself lives only in the cookie. */
export function hashToken(token: string): string {
	return createHash('sha256').update(token).digest('hex');
}

interface SessionUserRow {
	user_id: string;
	expires_at: Date | string;
	email: string;
	name: string;
	role: Role;
	team_id: string | null;
	unit_system: UnitSystem;
}

/** lucia 3's adapter interface, over the Sequelize models (no lucia-specific tables). */
class SequelizeAdapter implements Adapter {
	/**
	 * Every signed-in request runs this, so it is one indexed join returning plain rows (no model
	 * instances): the session by its hash and its user, only while the user is active.
	 */
	async getSessionAndUser(
		sessionId: string
	): Promise<[DatabaseSession | null, DatabaseUser | null]> {
		const rows = await sequelize.query<SessionUserRow>(
			`SELECT s.user_id, s.expires_at, u.email, u.name, u.role, u.team_id, u.unit_system
			   FROM sessions s JOIN users u ON u.id = s.user_id
			  WHERE s.id = :id AND u.active`,
			{ replacements: { id: hashToken(sessionId) }, type: QueryTypes.SELECT }
		);
		const row = rows[0];
		if (!row) return [null, null];
		return [
			{ id: sessionId, userId: row.user_id, expiresAt: new Date(row.expires_at), attributes: {} },
			{
				id: row.user_id,
				attributes: {
					email: row.email,
					name: row.name,
					role: row.role,
					teamId: row.team_id,
					unitSystem: row.unit_system,
					active: true
				}
			}
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
