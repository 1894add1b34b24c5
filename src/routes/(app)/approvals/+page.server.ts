import { requirePermission } from '$lib/server/auth/guard';
import { listQuotes } from '$lib/server/repositories/quotes';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const user = requirePermission(event, 'quote:approve');
	const { rows } = await listQuotes(user, { state: 'awaiting-approval', sort: 'updated', dir: 'asc', pageSize: 100 });
	return { rows };
};
