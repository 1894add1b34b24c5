import { error } from '@sveltejs/kit';
import { requirePermission } from '$lib/server/auth/guard';
import { BATTERIES } from '$lib/server/catalogue-admin';
import {
	findBattery,
	surveysReferencingModel,
	trucksListingBattery
} from '$lib/server/repositories/catalogue';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const user = requirePermission(event, 'admin:catalogue');
	const battery = await findBattery(event.params.id);
	if (!battery) error(404, 'No battery with this id.');
	const [trucks, surveys] = await Promise.all([
		trucksListingBattery(battery.id),
		surveysReferencingModel([battery.id, battery.code])
	]);
	return {
		entry: BATTERIES.entry(battery),
		trucks,
		surveys,
		created: event.url.searchParams.has('created'),
		form: await BATTERIES.form(battery, user.unitSystem),
		unitSystem: user.unitSystem
	};
};

const entryActions = BATTERIES.entryActions();

export const actions: Actions = {
	save: entryActions.save,
	retire: entryActions.retire,
	restore: entryActions.restore,
	delete: entryActions.delete
};
