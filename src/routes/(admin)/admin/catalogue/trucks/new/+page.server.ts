import { fail, redirect } from '@sveltejs/kit';
import { superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { readTruckForm, truckFormSchema, truckFormValues } from '$lib/schemas/catalogue';
import { requirePermission } from '$lib/server/auth/guard';
import { TRUCK_WORDS, refusedSave } from '$lib/server/catalogue-admin';
import {
	createTruckModel,
	findTruckModel,
	listBatteries,
	listTruckFamilies
} from '$lib/server/repositories/catalogue';
import { batteryOptions } from '../batteries';
import type { Actions, PageServerLoad } from './$types';

const adapter = zod4(truckFormSchema);
const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

export const load: PageServerLoad = async (event) => {
	const user = requirePermission(event, 'admin:catalogue');
	// "?from=<id>": start from a copy of another model, without its code
	const from = event.url.searchParams.get('from');
	const source = from && UUID.test(from) ? await findTruckModel(from) : null;
	const start = source
		? { ...truckFormValues(source, user.unitSystem), code: '', name: `${source.name} (copy)` }
		: { units: user.unitSystem };
	const [batteries, families] = await Promise.all([
		listBatteries({ includeRetired: true }),
		listTruckFamilies()
	]);
	return {
		form: await superValidate(start, adapter, { errors: false }),
		copiedFrom: source ? source.code : null,
		batteries: batteryOptions(batteries),
		families,
		unitSystem: user.unitSystem
	};
};

export const actions: Actions = {
	create: async (event) => {
		requirePermission(event, 'admin:catalogue');
		const form = await superValidate(event.request, adapter);
		if (!form.valid) return fail(400, { form });
		const read = readTruckForm(form.data);
		if (!read.ok) return fail(400, { form });
		const outcome = await createTruckModel(read.value);
		if (!outcome.ok) return refusedSave(form, outcome, TRUCK_WORDS);
		redirect(303, `/admin/catalogue/trucks/${outcome.row.id}?created=1`);
	}
};
