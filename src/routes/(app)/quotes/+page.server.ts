import { requirePermission } from '$lib/server/auth/guard';
import { quoteListQuerySchema } from '$lib/schemas/quote';
import { listQuotes } from '$lib/server/repositories/quotes';
import { listUsers } from '$lib/server/repositories/users';
import { recordScope } from '$lib/server/auth/permissions';
import type { PageServerLoad } from './$types';

const PAGE_SIZE = 25;

export const load: PageServerLoad = async (event) => {
	const user = requirePermission(event, 'quote:read');
	const filters = quoteListQuerySchema.parse(Object.fromEntries(event.url.searchParams));
	const [{ rows, total }, users] = await Promise.all([
		listQuotes(user, { ...filters, pageSize: PAGE_SIZE }),
		recordScope(user.role) === 'all' ? listUsers() : Promise.resolve([])
	]);
	return {
		rows,
		total,
		pages: Math.max(1, Math.ceil(total / PAGE_SIZE)),
		filters: { ...filters, page: filters.page ?? 1 },
		reps: users.filter((u) => u.role !== 'admin').map((u) => ({ id: u.id, name: u.name }))
	};
};
