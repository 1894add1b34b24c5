import { redirect } from '@sveltejs/kit';
import { requirePermission } from '$lib/server/auth/guard';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = (event) => {
	requirePermission(event, 'admin:catalogue');
	redirect(303, '/admin/catalogue/trucks');
};
