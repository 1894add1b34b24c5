import { fail, redirect } from '@sveltejs/kit';
import { superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { batteryFormSchema, batteryFormValues, readBatteryForm } from '$lib/schemas/catalogue';
import { requirePermission } from '$lib/server/auth/guard';
import { BATTERY_WORDS, refusedSave } from '$lib/server/catalogue-admin';
import { createBattery, findBattery } from '$lib/server/repositories/catalogue';
import type { Actions, PageServerLoad } from './$types';

const adapter = zod4(batteryFormSchema);
const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

export const load: PageServerLoad = async (event) => {
	const user = requirePermission(event, 'admin:catalogue');
	const from = event.url.searchParams.get('from');
	const source = from && UUID.test(from) ? await findBattery(from) : null;
	const start = source
		? { ...batteryFormValues(source, user.unitSystem), code: '', name: `${source.name} (copy)` }
		: { units: user.unitSystem };
	return {
		form: await superValidate(start, adapter, { errors: false }),
		copiedFrom: source ? source.code : null,
		unitSystem: user.unitSystem
	};
};

export const actions: Actions = {
	create: async (event) => {
		requirePermission(event, 'admin:catalogue');
		const form = await superValidate(event.request, adapter);
		if (!form.valid) return fail(400, { form });
		const read = readBatteryForm(form.data);
		if (!read.ok) return fail(400, { form });
		const outcome = await createBattery(read.value);
		if (!outcome.ok) return refusedSave(form, outcome, BATTERY_WORDS);
		redirect(303, `/admin/catalogue/batteries/${outcome.row.id}?created=1`);
	}
};
