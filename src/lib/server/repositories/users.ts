import { Op, UniqueConstraintError, fn, col, where as sqlWhere } from 'sequelize';
import { sequelize } from '../db';
import { Team, User, Session } from '../db/models';
import { dummyPasswordHash, hashPassword, verifyPassword } from '../auth/password';
import type { Role, SessionUser } from '../auth/types';

export interface UserRow {
	id: string;
	email: string;
	name: string;
	role: Role;
	teamId: string | null;
	teamName: string | null;
	active: boolean;
	createdAt: string;
}

function toSessionUser(u: User): SessionUser {
	return { id: u.id, email: u.email, name: u.name, role: u.role, teamId: u.teamId ?? null, unitSystem: u.unitSystem };
}

function byEmail(email: string) {
	return sqlWhere(fn('lower', col('email')), email.trim().toLowerCase());
}

/**
 * The active user with this e-mail and password, else null. An unknown e-mail still costs one
 * Argon2 verification so response time does not reveal which addresses exist.
 */
export async function authenticate(email: string, password: string): Promise<SessionUser | null> {
	const user = await User.findOne({ where: byEmail(email) });
	if (!user) {
		await verifyPassword(await dummyPasswordHash(), password);
		return null;
	}
	const ok = await verifyPassword(user.passwordHash, password);
	return ok && user.active ? toSessionUser(user) : null;
}

export async function listUsers(): Promise<UserRow[]> {
	const users = await User.findAll({ include: [{ model: Team, as: 'team' }], order: [['name', 'ASC']] });
	return users.map((u) => ({
		id: u.id,
		email: u.email,
		name: u.name,
		role: u.role,
		teamId: u.teamId ?? null,
		teamName: (u as unknown as { team?: Team }).team?.name ?? null,
		active: u.active,
		createdAt: u.createdAt.toISOString()
	}));
}

export async function listTeams(): Promise<{ id: string; name: string }[]> {
	const teams = await Team.findAll({ order: [['name', 'ASC']] });
	return teams.map((t) => ({ id: t.id, name: t.name }));
}

export async function emailTaken(email: string): Promise<boolean> {
	return (await User.count({ where: byEmail(email) })) > 0;
}

/** Another account has this e-mail (two admins, or one double tap, adding it at the same moment). */
export class EmailTakenError extends Error {}

/** Adds an account; throws EmailTakenError when the e-mail (in any case) has one already. */
export async function createUser(input: {
	name: string;
	email: string;
	role: Role;
	teamId: string | null;
	password: string;
}): Promise<string> {
	try {
		const user = await User.create({
			name: input.name,
			email: input.email.trim().toLowerCase(),
			role: input.role,
			teamId: input.teamId,
			passwordHash: await hashPassword(input.password)
		});
		return user.id;
	} catch (err) {
		// the unique index on lower(email) decides between saves at the same moment
		if (err instanceof UniqueConstraintError) throw new EmailTakenError(input.email);
		throw err;
	}
}

/**
 * Changes role, team or active flag; deactivating ends every session of the user at once (one
 * transaction: a deactivated user never keeps a session).
 */
export async function updateUser(input: { id: string; role: Role; teamId: string | null; active: boolean }): Promise<boolean> {
	return sequelize.transaction(async (transaction) => {
		const [count] = await User.update(
			{ role: input.role, teamId: input.teamId, active: input.active },
			{ where: { id: input.id }, transaction }
		);
		if (!input.active) await Session.destroy({ where: { userId: input.id }, transaction });
		return count > 0;
	});
}

/**
 * Sets a new password and signs the user out everywhere (except, optionally, one session hash), in
 * one transaction: the old sessions never outlive the old password.
 */
export async function changePassword(userId: string, password: string, keepSessionHash?: string): Promise<void> {
	const passwordHash = await hashPassword(password);
	await sequelize.transaction(async (transaction) => {
		await User.update({ passwordHash }, { where: { id: userId }, transaction });
		await Session.destroy({
			where: keepSessionHash ? { userId, id: { [Op.ne]: keepSessionHash } } : { userId },
			transaction
		});
	});
}

export async function setUnitSystem(userId: string, unitSystem: 'metric' | 'imperial'): Promise<void> {
	await User.update({ unitSystem }, { where: { id: userId } });
}

export async function countActiveAdmins(): Promise<number> {
	return User.count({ where: { role: 'admin', active: true } });
}
