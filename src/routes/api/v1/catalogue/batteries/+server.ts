import { json } from '@sveltejs/kit';
import { requirePermission } from '$lib/server/auth/guard';
import {
	compatibleBatteries,
	findTruckModel,
	listBatteries,
	type BatteryRow
} from '$lib/server/repositories/catalogue';
import type { RequestHandler } from './$types';

const shape = (b: BatteryRow) => ({ id: b.id, code: b.code, name: b.name, spec: b.spec });

/**
 * GET /api/v1/catalogue/batteries — the batteries a new survey may choose (retired ones left out);
 * with `?truck=<id or code>`, only those the truck model lists as compatible (a retired model still
 * answers, for surveys that use it). 404 for an unknown truck. Signed-in staff.
 */
export const GET: RequestHandler = async (event) => {
	requirePermission(event, 'catalogue:read');
	const headers = { 'cache-control': 'private, no-cache' };
	const ref = event.url.searchParams.get('truck');
	if (ref === null)
		return json({ truck: null, batteries: (await listBatteries()).map(shape) }, { headers });
	const trimmed = ref.trim();
	if (trimmed === '' || trimmed.length > 100) {
		return json(
			{
				message: 'Give a truck model id or code as ?truck=.',
				errors: { truck: ['Choose a truck model.'] }
			},
			{ status: 400 }
		);
	}
	const truck = await findTruckModel(trimmed);
	if (!truck) return json({ message: 'No truck model with this id or code.' }, { status: 404 });
	return json(
		{
			truck: { id: truck.id, code: truck.code, name: truck.name, retired: truck.retired },
			batteries: (await compatibleBatteries(truck.id)).map(shape)
		},
		{ headers }
	);
};
