import { randomUUID } from 'node:crypto';
import { fail, redirect } from '@sveltejs/kit';
import { setError, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { customerSchema } from '$lib/schemas/customer';
import { requirePermission } from '$lib/server/auth/guard';
import { createCustomer } from '$lib/server/repositories/customers';
import type { Actions, PageServerLoad } from './$types';

const adapter = zod4(customerSchema);
const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/;

export const load: PageServerLoad = async (event) => {
	requirePermission(event, 'customer:manage');
	return { form: await superValidate(adapter), clientToken: randomUUID() };
};

export const actions: Actions = {
	default: async (event) => {
		const user = requirePermission(event, 'customer:manage');
		const raw = await event.request.formData();
		const form = await superValidate(raw, adapter);
		if (!form.valid) return fail(400, { form });
		const token = raw.get('clientToken');
		const saved = await createCustomer(form.data, user, typeof token === 'string' && UUID.test(token) ? token : null);
		if (!saved.ok) return setError(form, 'accountNumber', 'message' in saved ? saved.message : 'Could not save.');
		redirect(303, `/customers/${saved.id}`);
	}
};
