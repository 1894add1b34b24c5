import { error } from '@sveltejs/kit';
import { requirePermission } from '$lib/server/auth/guard';
import { getCaughtMail } from '$lib/server/repositories/caught-mail';
import { isUuid } from '$lib/server/uuid';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	requirePermission(event, 'admin:mail');
	const mail = isUuid(event.params.id) ? await getCaughtMail(event.params.id) : null;
	if (!mail) error(404, 'No caught message with that id.');
	return { mail };
};
