import { error, fail, redirect } from '@sveltejs/kit';
import { setError, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { customerSchema } from '$lib/schemas/customer';
import { requirePermission } from '$lib/server/auth/guard';
import { getCustomer, updateCustomer } from '$lib/server/repositories/customers';
import type { Actions, PageServerLoad } from './$types';

const adapter = zod4(customerSchema);

export const load: PageServerLoad = async (event) => {
	requirePermission(event, 'customer:manage');
	const customer = await getCustomer(event.params.id);
	if (!customer) error(404, 'There is no such customer.');
	const form = await superValidate(
		{ name: customer.name, accountNumber: customer.accountNumber ?? '', notes: customer.notes },
		adapter
	);
	return { form, customer: { id: customer.id, name: customer.name } };
};

export const actions: Actions = {
	default: async (event) => {
		requirePermission(event, 'customer:manage');
		const form = await superValidate(event.request, adapter);
		if (!form.valid) return fail(400, { form });
		const saved = await updateCustomer(event.params.id, form.data);
		if (!saved.ok) {
			if ('notFound' in saved) error(404, 'There is no such customer.');
			return setError(form, saved.field === 'accountNumber' ? 'accountNumber' : '', saved.message);
		}
		redirect(303, `/customers/${event.params.id}`);
	}
};
