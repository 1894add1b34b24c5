import { json } from '@sveltejs/kit';
import { requirePermission } from '$lib/server/auth/guard';
import { listTruckModels } from '$lib/server/repositories/catalogue';
import type { RequestHandler } from './$types';

/**
 * GET /api/v1/catalogue/trucks — the truck models a new survey may choose (retired ones left out),
 * with the engine spec (mm, kg, degrees) and the ids of their compatible batteries. Signed-in staff.
 */
export const GET: RequestHandler = async (event) => {
	requirePermission(event, 'catalogue:read');
	const trucks = await listTruckModels();
	return json(
		{
			trucks: trucks.map((t) => ({
				id: t.id,
				code: t.code,
				name: t.name,
				family: t.family,
				capacityKg: t.capacityKg,
				spec: t.spec,
				batteryIds: t.batteryIds
			}))
		},
		{ headers: { 'cache-control': 'private, no-cache' } }
	);
};
