import { json } from '@sveltejs/kit';
import { requirePermission } from '$lib/server/auth/guard';
import { listUsers } from '$lib/server/repositories/users';
import type { RequestHandler } from './$types';

/** Admins only: everyone with an account (no password hashes). */
export const GET: RequestHandler = async (event) => {
	requirePermission(event, 'admin:users');
	return json({ users: await listUsers() });
};
