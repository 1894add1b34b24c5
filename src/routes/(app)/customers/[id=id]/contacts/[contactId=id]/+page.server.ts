import { error, fail, redirect } from '@sveltejs/kit';
import { setError, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { contactSchema } from '$lib/schemas/customer';
import { requirePermission } from '$lib/server/auth/guard';
import { getContact, getCustomer, updateContact } from '$lib/server/repositories/customers';
import type { Actions, PageServerLoad } from './$types';

const adapter = zod4(contactSchema);

export const load: PageServerLoad = async (event) => {
	requirePermission(event, 'customer:manage');
	const [customer, contact] = await Promise.all([
		getCustomer(event.params.id),
		getContact(event.params.id, event.params.contactId)
	]);
	if (!customer || !contact) error(404, 'There is no such contact.');
	const form = await superValidate(
		{ name: contact.name, roleTitle: contact.roleTitle, email: contact.email, phone: contact.phone, siteId: contact.siteId ?? '' },
		adapter
	);
	return {
		customer: { id: customer.id, name: customer.name },
		contact: { id: contact.id, name: contact.name },
		sites: customer.sites.map((s) => ({ id: s.id, name: s.name, city: s.city })),
		form
	};
};

export const actions: Actions = {
	default: async (event) => {
		requirePermission(event, 'customer:manage');
		const form = await superValidate(event.request, adapter);
		if (!form.valid) return fail(400, { form });
		const saved = await updateContact(event.params.id, event.params.contactId, form.data);
		if (!saved.ok) {
			if ('notFound' in saved) error(404, 'There is no such contact.');
			return setError(form, 'siteId', saved.message);
		}
		redirect(303, `/customers/${event.params.id}#contacts`);
	}
};
