import { redirect } from '@sveltejs/kit';
import { startPage } from '$lib/server/auth/permissions';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = ({ locals }) => {
	redirect(303, locals.user ? startPage(locals.user.role) : '/login');
};
