import type { Role } from './types';

/**
 * The one permissions matrix of Traywise. Pure: guards, pages and tests all read it.
 * Rows are actions a person can take; a role either may or may not.
 */
export const PERMISSIONS = {
	'evaluate:run': ['rep', 'manager', 'admin'],
	'catalogue:read': ['rep', 'manager', 'admin'],
	'customer:manage': ['rep', 'manager', 'admin'],
	'survey:edit': ['rep', 'manager'],
	'survey:read': ['rep', 'manager', 'admin'],
	'upload:read': ['rep', 'manager', 'admin'],
	'quote:edit': ['rep', 'manager'],
	'quote:read': ['rep', 'manager', 'admin'],
	'quote:submit': ['rep', 'manager'],
	'quote:send': ['rep', 'manager'],
	'quote:approve': ['manager'],
	'quote:see-cost': ['rep', 'manager', 'admin'],
	'pipeline:read': ['manager', 'admin'],
	'admin:users': ['admin'],
	'admin:catalogue': ['admin'],
	'admin:price-book': ['admin'],
	'admin:settings': ['admin'],
	'admin:mail': ['admin']
} as const satisfies Record<string, readonly Role[]>;

export type Permission = keyof typeof PERMISSIONS;
export const ROLES: readonly Role[] = ['rep', 'manager', 'admin'];

export function can(role: Role, permission: Permission): boolean {
	return (PERMISSIONS[permission] as readonly Role[]).includes(role);
}

/**
 * Whose surveys and quotes a role sees: a rep their own and their team's, managers and
 * admins everyone's.
 */
export type RecordScope = 'team' | 'all';
export function recordScope(role: Role): RecordScope {
	return role === 'rep' ? 'team' : 'all';
}

/** May a user with this role, id and team see a record owned by `owner`? */
export function canSeeRecord(
	viewer: { id: string; role: Role; teamId: string | null },
	owner: { id: string; teamId: string | null }
): boolean {
	if (recordScope(viewer.role) === 'all') return true;
	if (viewer.id === owner.id) return true;
	return viewer.teamId !== null && viewer.teamId === owner.teamId;
}

/** Where each role lands after signing in. */
export function startPage(role: Role): string {
	switch (role) {
		case 'rep':
			return '/surveys';
		case 'manager':
			return '/pipeline';
		case 'admin':
			return '/admin/users';
	}
}
