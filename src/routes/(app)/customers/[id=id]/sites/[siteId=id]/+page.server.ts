import { error, fail, redirect } from '@sveltejs/kit';
import { superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { siteSchema } from '$lib/schemas/customer';
import { requirePermission } from '$lib/server/auth/guard';
import { customerName, getSite, updateSite } from '$lib/server/repositories/customers';
import type { Actions, PageServerLoad } from './$types';

const adapter = zod4(siteSchema);

export const load: PageServerLoad = async (event) => {
	requirePermission(event, 'customer:manage');
	const [name, site] = await Promise.all([customerName(event.params.id), getSite(event.params.id, event.params.siteId)]);
	if (name === null || !site) error(404, 'There is no such site.');
	const { id: _id, customerId: _customerId, ...fields } = site;
	return { customer: { id: event.params.id, name }, site: { id: site.id, name: site.name }, form: await superValidate(fields, adapter) };
};

export const actions: Actions = {
	default: async (event) => {
		requirePermission(event, 'customer:manage');
		const form = await superValidate(event.request, adapter);
		if (!form.valid) return fail(400, { form });
		const saved = await updateSite(event.params.id, event.params.siteId, form.data);
		if (!saved.ok) error(404, 'There is no such site.');
		redirect(303, `/customers/${event.params.id}#sites`);
	}
};
