import { requirePermission } from '$lib/server/auth/guard';
import { listQuery } from '$lib/server/catalogue-admin';
import { listBatteries, listTruckModels } from '$lib/server/repositories/catalogue';
import type { PageServerLoad } from './$types';

const CHEMISTRIES = ['lead-acid', 'lithium-ion'] as const;

export const load: PageServerLoad = async (event) => {
	const user = requirePermission(event, 'admin:catalogue');
	const q = event.url.searchParams;
	const { status, deleted, shown } = listQuery(q);
	const chemistry = CHEMISTRIES.find((c) => c === q.get('chemistry')) ?? '';
	const [batteries, trucks] = await Promise.all([
		listBatteries({ includeRetired: true }),
		listTruckModels({ includeRetired: true })
	]);
	return {
		unitSystem: user.unitSystem,
		status,
		chemistry,
		deleted,
		total: batteries.length,
		batteries: batteries
			.filter((b) => (chemistry ? b.spec.chemistry === chemistry : true))
			.filter(shown)
			.map((b) => ({
				id: b.id,
				code: b.code,
				name: b.name,
				retired: b.retired,
				priceCents: b.priceCents,
				spec: {
					voltage: b.spec.voltage,
					capacityAh: b.spec.capacityAh,
					lengthMm: b.spec.lengthMm,
					widthMm: b.spec.widthMm,
					heightMm: b.spec.heightMm,
					weightKg: b.spec.weightKg,
					chemistry: b.spec.chemistry
				},
				trucks: trucks.filter((t) => t.batteryIds.includes(b.id)).map((t) => t.code)
			}))
	};
};
