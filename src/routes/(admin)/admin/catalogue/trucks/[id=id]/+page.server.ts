import { error, fail, redirect } from '@sveltejs/kit';
import { message, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { readTruckForm, truckFormSchema, truckFormValues } from '$lib/schemas/catalogue';
import { requirePermission } from '$lib/server/auth/guard';
import { TRUCK_WORDS, refusedDelete, refusedSave } from '$lib/server/catalogue-admin';
import {
	deleteTruckModel,
	findTruckModel,
	listBatteries,
	listTruckFamilies,
	restoreTruckModel,
	retireTruckModel,
	surveysReferencingModel,
	updateTruckModel
} from '$lib/server/repositories/catalogue';
import { batteryOptions } from '../batteries';
import type { Actions, PageServerLoad } from './$types';

const adapter = zod4(truckFormSchema);

export const load: PageServerLoad = async (event) => {
	const user = requirePermission(event, 'admin:catalogue');
	const truck = await findTruckModel(event.params.id);
	if (!truck) error(404, 'No truck model with this id.');
	const [batteries, families, surveys] = await Promise.all([
		listBatteries({ includeRetired: true }),
		listTruckFamilies(),
		surveysReferencingModel([truck.id, truck.code])
	]);
	return {
		truck: { id: truck.id, code: truck.code, name: truck.name, retired: truck.retired },
		surveys,
		created: event.url.searchParams.has('created'),
		form: await superValidate(truckFormValues(truck, user.unitSystem), adapter, { errors: false }),
		batteries: batteryOptions(batteries),
		families,
		unitSystem: user.unitSystem
	};
};

export const actions: Actions = {
	save: async (event) => {
		const user = requirePermission(event, 'admin:catalogue');
		const form = await superValidate(event.request, adapter);
		if (!form.valid) return fail(400, { form });
		const read = readTruckForm(form.data);
		if (!read.ok) return fail(400, { form });
		const outcome = await updateTruckModel(event.params.id, read.value);
		if (!outcome.ok) return refusedSave(form, outcome, TRUCK_WORDS);
		// the stored values, as they will read from now on
		const saved = await superValidate(truckFormValues(outcome.row, user.unitSystem), adapter, {
			errors: false
		});
		return message(saved, `Saved ${outcome.row.code}.`);
	},
	retire: async (event) => {
		requirePermission(event, 'admin:catalogue');
		if (!(await retireTruckModel(event.params.id))) error(404, 'No truck model with this id.');
		return {
			done: 'Retired: new surveys no longer offer this model; surveys that use it keep it.'
		};
	},
	restore: async (event) => {
		requirePermission(event, 'admin:catalogue');
		if (!(await restoreTruckModel(event.params.id))) error(404, 'No truck model with this id.');
		return { done: 'Restored: new surveys offer this model again.' };
	},
	delete: async (event) => {
		requirePermission(event, 'admin:catalogue');
		const truck = await findTruckModel(event.params.id);
		if (!truck) error(404, 'No truck model with this id.');
		const outcome = await deleteTruckModel(truck.id);
		if (!outcome.ok) return refusedDelete(outcome, truck.code, TRUCK_WORDS);
		redirect(303, `/admin/catalogue/trucks?deleted=${encodeURIComponent(outcome.code)}`);
	}
};
