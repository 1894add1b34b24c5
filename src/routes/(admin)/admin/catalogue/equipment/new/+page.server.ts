import { superValidate } from 'sveltekit-superforms';
import { EDITABLE_EQUIPMENT_KINDS } from '$lib/schemas/catalogue';
import { requirePermission } from '$lib/server/auth/guard';
import { EQUIPMENT } from '$lib/server/catalogue-admin';
import { KIND_LABELS } from '$lib/server/rules/catalogue';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const user = requirePermission(event, 'admin:catalogue');
	const q = event.url.searchParams;
	const kind = EDITABLE_EQUIPMENT_KINDS.find((k) => k === q.get('kind')) ?? 'side-door';
	const copy = await EQUIPMENT.copyOf(event.url, user.unitSystem);
	const start = copy?.values ?? { units: user.unitSystem, kind };
	return {
		form: await superValidate(start, EQUIPMENT.adapter, { errors: false }),
		copiedFrom: copy?.code ?? null,
		kinds: EDITABLE_EQUIPMENT_KINDS.map((k) => ({ value: k, label: KIND_LABELS[k] })),
		unitSystem: user.unitSystem
	};
};

export const actions: Actions = {
	create: EQUIPMENT.createAction()
};
