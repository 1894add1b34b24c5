import { error, fail, redirect } from '@sveltejs/kit';
import { setError, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { contactSchema } from '$lib/schemas/customer';
import { requirePermission } from '$lib/server/auth/guard';
import { addContact, getCustomer } from '$lib/server/repositories/customers';
import type { Actions, PageServerLoad } from './$types';

const adapter = zod4(contactSchema);

export const load: PageServerLoad = async (event) => {
	requirePermission(event, 'customer:manage');
	const customer = await getCustomer(event.params.id);
	if (!customer) error(404, 'There is no such customer.');
	// a contact added from a site's card starts on that site
	const siteId = event.url.searchParams.get('site') ?? '';
	const form = await superValidate(
		{ siteId: customer.sites.some((s) => s.id === siteId) ? siteId : '' },
		adapter,
		{ errors: false }
	);
	return {
		customer: { id: customer.id, name: customer.name },
		sites: customer.sites.map((s) => ({ id: s.id, name: s.name, city: s.city })),
		form
	};
};

export const actions: Actions = {
	default: async (event) => {
		requirePermission(event, 'customer:manage');
		const form = await superValidate(event.request, adapter);
		if (!form.valid) return fail(400, { form });
		const saved = await addContact(event.params.id, form.data);
		if (!saved.ok) {
			if ('notFound' in saved) error(404, 'There is no such customer.');
			return setError(form, 'siteId', saved.message);
		}
		redirect(303, `/customers/${event.params.id}#contacts`);
	}
};
