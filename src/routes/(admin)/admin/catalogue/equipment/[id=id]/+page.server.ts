import { error } from '@sveltejs/kit';
import { EDITABLE_EQUIPMENT_KINDS } from '$lib/schemas/catalogue';
import { requirePermission } from '$lib/server/auth/guard';
import { EQUIPMENT } from '$lib/server/catalogue-admin';
import { KIND_LABELS } from '$lib/server/rules/catalogue';
import { findEquipment, surveysReferencingSku } from '$lib/server/repositories/catalogue';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const user = requirePermission(event, 'admin:catalogue');
	const item = await findEquipment(event.params.id);
	if (!item) error(404, 'No equipment item with this id.');
	return {
		entry: EQUIPMENT.entry(item),
		surveys: await surveysReferencingSku(item.sku),
		created: event.url.searchParams.has('created'),
		form: await EQUIPMENT.form(item, user.unitSystem),
		kinds: EDITABLE_EQUIPMENT_KINDS.map((k) => ({ value: k, label: KIND_LABELS[k] })),
		unitSystem: user.unitSystem
	};
};

const entryActions = EQUIPMENT.entryActions();

export const actions: Actions = {
	save: entryActions.save,
	retire: entryActions.retire,
	restore: entryActions.restore,
	delete: entryActions.delete
};
