import { requirePermission } from '$lib/server/auth/guard';
import { listQuery } from '$lib/server/catalogue-admin';
import {
	listBatteries,
	listTruckFamilies,
	listTruckModels
} from '$lib/server/repositories/catalogue';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const user = requirePermission(event, 'admin:catalogue');
	const q = event.url.searchParams;
	const { status, deleted, shown } = listQuery(q);
	const [trucks, families, batteries] = await Promise.all([
		listTruckModels({ includeRetired: true }),
		listTruckFamilies(),
		listBatteries({ includeRetired: true })
	]);
	const family = families.find((f) => f === q.get('family')) ?? '';
	const batteryCodes = new Map(batteries.map((b) => [b.id, b.code]));
	return {
		unitSystem: user.unitSystem,
		families,
		family,
		status,
		deleted,
		total: trucks.length,
		trucks: trucks
			.filter((t) => (family ? t.family === family : true))
			.filter(shown)
			.map((t) => ({
				id: t.id,
				code: t.code,
				name: t.name,
				family: t.family,
				capacityKg: t.capacityKg,
				priceCents: t.priceCents,
				retired: t.retired,
				voltage: t.spec.voltage,
				compartment: t.spec.compartment,
				batteryWeightKg: t.spec.batteryWeightKg,
				batteries: t.batteryIds.map((id) => batteryCodes.get(id) ?? '?').sort()
			}))
	};
};
