import { superValidate } from 'sveltekit-superforms';
import { requirePermission } from '$lib/server/auth/guard';
import { BATTERIES } from '$lib/server/catalogue-admin';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const user = requirePermission(event, 'admin:catalogue');
	const copy = await BATTERIES.copyOf(event.url, user.unitSystem);
	const start = copy?.values ?? { units: user.unitSystem };
	return {
		form: await superValidate(start, BATTERIES.adapter, { errors: false }),
		copiedFrom: copy?.code ?? null,
		unitSystem: user.unitSystem
	};
};

export const actions: Actions = {
	create: BATTERIES.createAction()
};
