import { error } from '@sveltejs/kit';
import { requirePermission } from '$lib/server/auth/guard';
import { TRUCKS } from '$lib/server/catalogue-admin';
import {
	findTruckModel,
	listBatteries,
	listTruckFamilies,
	surveysReferencingModel
} from '$lib/server/repositories/catalogue';
import { batteryOptions } from '../batteries';
import type { Actions, PageServerLoad } from './$types';

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
		entry: TRUCKS.entry(truck),
		surveys,
		created: event.url.searchParams.has('created'),
		form: await TRUCKS.form(truck, user.unitSystem),
		batteries: batteryOptions(batteries),
		families,
		unitSystem: user.unitSystem
	};
};

const entryActions = TRUCKS.entryActions();

export const actions: Actions = {
	save: entryActions.save,
	retire: entryActions.retire,
	restore: entryActions.restore,
	delete: entryActions.delete
};
