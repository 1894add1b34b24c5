import { requirePermission } from '$lib/server/auth/guard';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = (event) => {
	requirePermission(event, 'admin:settings');
	return {};
};
