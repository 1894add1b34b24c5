import { requirePermission } from '$lib/server/auth/guard';
import { listAwaitingApproval } from '$lib/server/repositories/quotes';
import { getCompanySettings } from '$lib/server/repositories/pricing';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const user = requirePermission(event, 'quote:approve');
	const [rows, settings] = await Promise.all([listAwaitingApproval(user), getCompanySettings()]);
	// one clock for every row's "waiting for", the server's, so the page and its hydration agree
	return { rows, now: new Date().toISOString(), timeZone: settings.timeZone || 'UTC' };
};
