import { error, fail, redirect } from '@sveltejs/kit';
import { superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { siteSchema } from '$lib/schemas/customer';
import { requirePermission } from '$lib/server/auth/guard';
import { addSite, customerName } from '$lib/server/repositories/customers';
import type { Actions, PageServerLoad } from './$types';

const adapter = zod4(siteSchema);

/**
 * Where to go once the site is saved, when the rep came from a survey (`?return=`): back to that
 * survey's site step, or to starting a survey for this customer. Anything else is ignored.
 */
function returnTo(url: URL, customerId: string): string | null {
	const to = url.searchParams.get('return') ?? '';
	if (/^\/surveys\/[0-9a-f-]{36}\/site$/.test(to)) return to;
	if (to === `/surveys?customer=${customerId}`) return to;
	return null;
}

export const load: PageServerLoad = async (event) => {
	requirePermission(event, 'customer:manage');
	const name = await customerName(event.params.id);
	if (name === null) error(404, 'There is no such customer.');
	return { customer: { id: event.params.id, name }, form: await superValidate(adapter), returnTo: returnTo(event.url, event.params.id) };
};

export const actions: Actions = {
	default: async (event) => {
		requirePermission(event, 'customer:manage');
		const form = await superValidate(event.request, adapter);
		if (!form.valid) return fail(400, { form });
		const saved = await addSite(event.params.id, form.data);
		if (!saved.ok) error(404, 'There is no such customer.');
		redirect(303, returnTo(event.url, event.params.id) ?? `/customers/${event.params.id}#sites`);
	}
};
