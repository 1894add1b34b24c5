import { fail, redirect } from '@sveltejs/kit';
import { superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import {
	EDITABLE_EQUIPMENT_KINDS,
	equipmentFormSchema,
	equipmentFormValues,
	readEquipmentForm
} from '$lib/schemas/catalogue';
import { requirePermission } from '$lib/server/auth/guard';
import { EQUIPMENT_WORDS, refusedSave } from '$lib/server/catalogue-admin';
import { KIND_LABELS } from '$lib/server/rules/catalogue';
import { createEquipment, findEquipment } from '$lib/server/repositories/catalogue';
import type { Actions, PageServerLoad } from './$types';

const adapter = zod4(equipmentFormSchema);

export const load: PageServerLoad = async (event) => {
	const user = requirePermission(event, 'admin:catalogue');
	const q = event.url.searchParams;
	const source = await findEquipment(q.get('from') ?? '');
	const kind = EDITABLE_EQUIPMENT_KINDS.find((k) => k === q.get('kind')) ?? 'side-door';
	const start = source
		? { ...equipmentFormValues(source, user.unitSystem), sku: '', name: `${source.name} (copy)` }
		: { units: user.unitSystem, kind };
	return {
		form: await superValidate(start, adapter, { errors: false }),
		copiedFrom: source ? source.sku : null,
		kinds: EDITABLE_EQUIPMENT_KINDS.map((k) => ({ value: k, label: KIND_LABELS[k] })),
		unitSystem: user.unitSystem
	};
};

export const actions: Actions = {
	create: async (event) => {
		requirePermission(event, 'admin:catalogue');
		const form = await superValidate(event.request, adapter);
		if (!form.valid) return fail(400, { form });
		const read = readEquipmentForm(form.data);
		if (!read.ok) return fail(400, { form });
		const outcome = await createEquipment(read.value);
		if (!outcome.ok) return refusedSave(form, outcome, EQUIPMENT_WORDS);
		redirect(303, `/admin/catalogue/equipment/${outcome.row.id}?created=1`);
	}
};
