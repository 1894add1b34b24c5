import { superValidate } from 'sveltekit-superforms';
import { requirePermission } from '$lib/server/auth/guard';
import { TRUCKS } from '$lib/server/catalogue-admin';
import { listBatteries, listTruckFamilies } from '$lib/server/repositories/catalogue';
import { batteryOptions } from '../batteries';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const user = requirePermission(event, 'admin:catalogue');
	// "?from=<id>": start from a copy of another model, without its code
	const copy = await TRUCKS.copyOf(event.url, user.unitSystem);
	const start = copy?.values ?? { units: user.unitSystem };
	const [batteries, families] = await Promise.all([
		listBatteries({ includeRetired: true }),
		listTruckFamilies()
	]);
	return {
		form: await superValidate(start, TRUCKS.adapter, { errors: false }),
		copiedFrom: copy?.code ?? null,
		batteries: batteryOptions(batteries),
		families,
		unitSystem: user.unitSystem
	};
};

export const actions: Actions = {
	create: TRUCKS.createAction()
};
