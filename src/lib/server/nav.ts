import { can, type Permission } from './auth/permissions';
import type { Role } from './auth/types';

export interface NavItem {
	href: string;
	label: string;
}

const ITEMS: (NavItem & { permission: Permission })[] = [
	{ href: '/pipeline', label: 'Pipeline', permission: 'pipeline:read' },
	{ href: '/approvals', label: 'Approvals', permission: 'quote:approve' },
	{ href: '/surveys', label: 'Surveys', permission: 'survey:read' },
	{ href: '/customers', label: 'Customers', permission: 'customer:manage' },
	{ href: '/quotes', label: 'Quotes', permission: 'quote:read' },
	{ href: '/admin/users', label: 'Users', permission: 'admin:users' },
	{ href: '/admin/catalogue', label: 'Catalogue', permission: 'admin:catalogue' },
	{ href: '/admin/price-book', label: 'Price book', permission: 'admin:price-book' },
	{ href: '/admin/settings', label: 'Settings', permission: 'admin:settings' },
	{ href: '/admin/mail', label: 'Caught mail', permission: 'admin:mail' }
];

/** The navigation a role sees, from the permissions matrix. */
export function navFor(role: Role): NavItem[] {
	return ITEMS.filter((i) => can(role, i.permission)).map(({ href, label }) => ({ href, label }));
}
