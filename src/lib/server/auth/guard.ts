import { error, redirect, type RequestEvent } from '@sveltejs/kit';
import { can, type Permission } from './permissions';
import type { Role, SessionUser } from './types';

function isApi(event: Pick<RequestEvent, 'url'>): boolean {
	return event.url.pathname.startsWith('/api/');
}

/**
 * The signed-in user, or: a redirect to /login for pages, a 401 for API routes.
 * Call it in every server load, action and `+server.ts` that needs a user.
 */
export function requireUser(event: Pick<RequestEvent, 'locals' | 'url'>): SessionUser {
	const user = event.locals.user;
	if (user) return user;
	if (isApi(event)) error(401, 'Sign in first.');
	const next = event.url.pathname + event.url.search;
	redirect(303, `/login?next=${encodeURIComponent(next)}`);
}

/** The signed-in user when their role is one of `roles`; 403 otherwise. */
export function requireRole(event: Pick<RequestEvent, 'locals' | 'url'>, ...roles: Role[]): SessionUser {
	const user = requireUser(event);
	if (!roles.includes(user.role)) error(403, 'Your role does not allow this.');
	return user;
}

/** The signed-in user when the permissions matrix allows `permission`; 403 otherwise. */
export function requirePermission(
	event: Pick<RequestEvent, 'locals' | 'url'>,
	permission: Permission
): SessionUser {
	const user = requireUser(event);
	if (!can(user.role, permission)) error(403, 'Your role does not allow this.');
	return user;
}
