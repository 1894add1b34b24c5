import { fail, redirect } from '@sveltejs/kit';
import { setError, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { customerSchema } from '$lib/schemas/customer';
import { requirePermission } from '$lib/server/auth/guard';
import { createCustomer } from '$lib/server/repositories/customers';
import type { Actions, PageServerLoad } from './$types';

const adapter = zod4(customerSchema);

export const load: PageServerLoad = async (event) => {
	requirePermission(event, 'customer:manage');
	return { form: await superValidate(adapter) };
};

export const actions: Actions = {
	default: async (event) => {
		const user = requirePermission(event, 'customer:manage');
		const form = await superValidate(event.request, adapter);
		if (!form.valid) return fail(400, { form });
		const saved = await createCustomer(form.data, user);
		if (!saved.ok) return setError(form, 'accountNumber', 'message' in saved ? saved.message : 'Could not save.');
		redirect(303, `/customers/${saved.id}`);
	}
};
