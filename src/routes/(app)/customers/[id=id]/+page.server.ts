import { error } from '@sveltejs/kit';
import { requirePermission } from '$lib/server/auth/guard';
import { getCustomer } from '$lib/server/repositories/customers';
import { listUploads } from '$lib/server/repositories/uploads';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	requirePermission(event, 'customer:manage');
	const [customer, photos] = await Promise.all([
		getCustomer(event.params.id),
		listUploads('customer', event.params.id, 'photo')
	]);
	if (!customer) error(404, 'There is no such customer.');
	return { customer, photos };
};
