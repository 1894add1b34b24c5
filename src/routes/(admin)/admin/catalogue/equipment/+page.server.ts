import { requirePermission } from '$lib/server/auth/guard';
import { listQuery } from '$lib/server/catalogue-admin';
import { KIND_LABELS } from '$lib/server/rules/catalogue';
import { listEquipment } from '$lib/server/repositories/catalogue';
import { EDITABLE_EQUIPMENT_KINDS } from '$lib/schemas/catalogue';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const user = requirePermission(event, 'admin:catalogue');
	const q = event.url.searchParams;
	const { status, deleted, shown } = listQuery(q);
	const kind = EDITABLE_EQUIPMENT_KINDS.find((k) => k === q.get('kind')) ?? '';
	const items = await listEquipment({ includeRetired: true });
	const order = new Map<string, number>(EDITABLE_EQUIPMENT_KINDS.map((k, i) => [k, i]));
	return {
		unitSystem: user.unitSystem,
		kinds: EDITABLE_EQUIPMENT_KINDS.map((k) => ({
			value: k,
			label: KIND_LABELS[k],
			count: items.filter((i) => i.kind === k).length
		})),
		kind,
		status,
		deleted,
		total: items.length,
		items: items
			.filter((i) => (kind ? i.kind === kind : true))
			.filter(shown)
			.sort(
				(a, b) =>
					(order.get(a.kind) ?? 99) - (order.get(b.kind) ?? 99) || a.sku.localeCompare(b.sku)
			)
			.map((i) => ({
				id: i.id,
				sku: i.sku,
				kind: i.kind,
				kindLabel: (KIND_LABELS as Record<string, string>)[i.kind] ?? i.kind,
				name: i.name,
				priceCents: i.priceCents,
				retired: i.retired,
				spec: i.spec
			}))
	};
};
