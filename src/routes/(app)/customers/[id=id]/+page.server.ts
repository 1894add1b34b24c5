import { randomUUID } from 'node:crypto';
import { error } from '@sveltejs/kit';
import { requirePermission } from '$lib/server/auth/guard';
import { can } from '$lib/server/auth/permissions';
import { getCustomer } from '$lib/server/repositories/customers';
import { listQuotes } from '$lib/server/repositories/quotes';
import { listSurveys } from '$lib/server/repositories/surveys';
import { listUploads } from '$lib/server/repositories/uploads';
import type { PageServerLoad } from './$types';

/** How many of the customer's surveys and quotes the page lists (the newest first). */
const RECENT = 10;

export const load: PageServerLoad = async (event) => {
	const user = requirePermission(event, 'customer:manage');
	const id = event.params.id;
	// the surveys and quotes this user may see, as on their own lists
	const [customer, photos, surveys, quotes] = await Promise.all([
		getCustomer(id),
		listUploads('customer', id, 'photo'),
		can(user.role, 'survey:read') ? listSurveys(user, { customerId: id, pageSize: RECENT }) : null,
		can(user.role, 'quote:read') ? listQuotes(user, { customerId: id, pageSize: RECENT }) : null
	]);
	if (!customer) error(404, 'There is no such customer.');
	return {
		customer,
		photos,
		surveys,
		quotes,
		canStartSurvey: can(user.role, 'survey:edit'),
		// one per page view: a double tap on "Start a survey here" makes one survey
		clientToken: randomUUID()
	};
};
