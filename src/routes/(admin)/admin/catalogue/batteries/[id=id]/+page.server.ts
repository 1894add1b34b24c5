import { error, fail, redirect } from '@sveltejs/kit';
import { message, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { batteryFormSchema, batteryFormValues, readBatteryForm } from '$lib/schemas/catalogue';
import { requirePermission } from '$lib/server/auth/guard';
import { BATTERY_WORDS, refusedDelete, refusedSave } from '$lib/server/catalogue-admin';
import {
	deleteBattery,
	findBattery,
	restoreBattery,
	retireBattery,
	surveysReferencingModel,
	trucksListingBattery,
	updateBattery
} from '$lib/server/repositories/catalogue';
import type { Actions, PageServerLoad } from './$types';

const adapter = zod4(batteryFormSchema);

export const load: PageServerLoad = async (event) => {
	const user = requirePermission(event, 'admin:catalogue');
	const battery = await findBattery(event.params.id);
	if (!battery) error(404, 'No battery with this id.');
	const [trucks, surveys] = await Promise.all([
		trucksListingBattery(battery.id),
		surveysReferencingModel([battery.id, battery.code])
	]);
	return {
		battery: { id: battery.id, code: battery.code, name: battery.name, retired: battery.retired },
		trucks,
		surveys,
		created: event.url.searchParams.has('created'),
		form: await superValidate(batteryFormValues(battery, user.unitSystem), adapter, {
			errors: false
		}),
		unitSystem: user.unitSystem
	};
};

export const actions: Actions = {
	save: async (event) => {
		const user = requirePermission(event, 'admin:catalogue');
		const form = await superValidate(event.request, adapter);
		if (!form.valid) return fail(400, { form });
		const read = readBatteryForm(form.data);
		if (!read.ok) return fail(400, { form });
		const outcome = await updateBattery(event.params.id, read.value);
		if (!outcome.ok) return refusedSave(form, outcome, BATTERY_WORDS);
		const saved = await superValidate(batteryFormValues(outcome.row, user.unitSystem), adapter, {
			errors: false
		});
		return message(saved, `Saved ${outcome.row.code}.`);
	},
	retire: async (event) => {
		requirePermission(event, 'admin:catalogue');
		if (!(await retireBattery(event.params.id))) error(404, 'No battery with this id.');
		return {
			done: 'Retired: new surveys no longer offer this battery; surveys that use it keep it.'
		};
	},
	restore: async (event) => {
		requirePermission(event, 'admin:catalogue');
		if (!(await restoreBattery(event.params.id))) error(404, 'No battery with this id.');
		return { done: 'Restored: new surveys offer this battery again.' };
	},
	delete: async (event) => {
		requirePermission(event, 'admin:catalogue');
		const battery = await findBattery(event.params.id);
		if (!battery) error(404, 'No battery with this id.');
		const outcome = await deleteBattery(battery.id);
		if (!outcome.ok) return refusedDelete(outcome, battery.code, BATTERY_WORDS);
		redirect(303, `/admin/catalogue/batteries?deleted=${encodeURIComponent(outcome.code)}`);
	}
};
