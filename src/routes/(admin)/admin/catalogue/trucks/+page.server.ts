import { requirePermission } from '$lib/server/auth/guard';
import {
	listBatteries,
	listTruckFamilies,
	listTruckModels
} from '$lib/server/repositories/catalogue';
import type { PageServerLoad } from './$types';

const STATUSES = ['all', 'active', 'retired'] as const;
type Status = (typeof STATUSES)[number];

export const load: PageServerLoad = async (event) => {
	const user = requirePermission(event, 'admin:catalogue');
	const q = event.url.searchParams;
	const status: Status = STATUSES.find((s) => s === q.get('status')) ?? 'all';
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
		deleted: q.get('deleted')?.slice(0, 60) ?? null,
		total: trucks.length,
		trucks: trucks
			.filter((t) => (family ? t.family === family : true))
			.filter((t) => (status === 'all' ? true : status === 'retired' ? t.retired : !t.retired))
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
