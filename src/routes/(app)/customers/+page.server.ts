import { requirePermission } from '$lib/server/auth/guard';
import { listCustomers } from '$lib/server/repositories/customers';
import { customerListQuerySchema, defaultDirection } from '$lib/schemas/customer';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	requirePermission(event, 'customer:manage');
	const params = customerListQuerySchema.parse({
		q: event.url.searchParams.get('q') ?? '',
		sort: event.url.searchParams.get('sort') ?? undefined,
		dir: event.url.searchParams.get('dir') ?? undefined,
		page: event.url.searchParams.get('page') ?? undefined
	});
	const dir = params.dir ?? defaultDirection(params.sort);
	const list = await listCustomers({ q: params.q, sort: params.sort, dir, page: params.page });
	return { list, query: { q: params.q, sort: params.sort, dir } };
};
