import { error, fail, redirect } from '@sveltejs/kit';
import { message, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import {
	EDITABLE_EQUIPMENT_KINDS,
	equipmentFormSchema,
	equipmentFormValues,
	readEquipmentForm
} from '$lib/schemas/catalogue';
import { requirePermission } from '$lib/server/auth/guard';
import { EQUIPMENT_WORDS, refusedDelete, refusedSave } from '$lib/server/catalogue-admin';
import { KIND_LABELS } from '$lib/server/rules/catalogue';
import {
	deleteEquipment,
	findEquipment,
	restoreEquipment,
	retireEquipment,
	surveysReferencingSku,
	updateEquipment
} from '$lib/server/repositories/catalogue';
import type { Actions, PageServerLoad } from './$types';

const adapter = zod4(equipmentFormSchema);

export const load: PageServerLoad = async (event) => {
	const user = requirePermission(event, 'admin:catalogue');
	const item = await findEquipment(event.params.id);
	if (!item) error(404, 'No equipment item with this id.');
	return {
		item: { id: item.id, sku: item.sku, name: item.name, retired: item.retired },
		surveys: await surveysReferencingSku(item.sku),
		created: event.url.searchParams.has('created'),
		form: await superValidate(equipmentFormValues(item, user.unitSystem), adapter, {
			errors: false
		}),
		kinds: EDITABLE_EQUIPMENT_KINDS.map((k) => ({ value: k, label: KIND_LABELS[k] })),
		unitSystem: user.unitSystem
	};
};

export const actions: Actions = {
	save: async (event) => {
		const user = requirePermission(event, 'admin:catalogue');
		const form = await superValidate(event.request, adapter);
		if (!form.valid) return fail(400, { form });
		const read = readEquipmentForm(form.data);
		if (!read.ok) return fail(400, { form });
		const outcome = await updateEquipment(event.params.id, read.value);
		if (!outcome.ok) return refusedSave(form, outcome, EQUIPMENT_WORDS);
		const saved = await superValidate(equipmentFormValues(outcome.row, user.unitSystem), adapter, {
			errors: false
		});
		return message(saved, `Saved ${outcome.row.sku}.`);
	},
	retire: async (event) => {
		requirePermission(event, 'admin:catalogue');
		if (!(await retireEquipment(event.params.id))) error(404, 'No equipment item with this id.');
		return { done: 'Retired: the engine no longer picks this item; quotes that list it keep it.' };
	},
	restore: async (event) => {
		requirePermission(event, 'admin:catalogue');
		if (!(await restoreEquipment(event.params.id))) error(404, 'No equipment item with this id.');
		return { done: 'Restored: the engine can pick this item again.' };
	},
	delete: async (event) => {
		requirePermission(event, 'admin:catalogue');
		const item = await findEquipment(event.params.id);
		if (!item) error(404, 'No equipment item with this id.');
		const outcome = await deleteEquipment(item.id);
		if (!outcome.ok) return refusedDelete(outcome, item.sku, EQUIPMENT_WORDS);
		redirect(303, `/admin/catalogue/equipment?deleted=${encodeURIComponent(outcome.code)}`);
	}
};
