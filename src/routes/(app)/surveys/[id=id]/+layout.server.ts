import { error } from '@sveltejs/kit';
import { requirePermission } from '$lib/server/auth/guard';
import { can } from '$lib/server/auth/permissions';
import { listBatteries, listTruckModels } from '$lib/server/repositories/catalogue';
import { getSurvey, sitesOfCustomer } from '$lib/server/repositories/surveys';
import { listUploads } from '$lib/server/repositories/uploads';
import type { LayoutServerLoad } from './$types';

export const load: LayoutServerLoad = async (event) => {
	const user = requirePermission(event, 'survey:read');
	const found = await getSurvey(event.params.id, user);
	if (!found.ok) error(found.status, found.status === 404 ? 'No such survey.' : 'This survey belongs to another team.');
	const survey = found.value;
	const [trucks, batteries, sites, uploads] = await Promise.all([
		listTruckModels(),
		listBatteries(),
		sitesOfCustomer(survey.customerId),
		listUploads('survey', survey.id)
	]);
	return {
		survey,
		unitSystem: user.unitSystem,
		canEdit: can(user.role, 'survey:edit'),
		uploads,
		sites,
		trucks: trucks.map((t) => ({ id: t.id, code: t.code, name: t.name, family: t.family, capacityKg: t.capacityKg, batteryIds: t.batteryIds, spec: t.spec })),
		batteries: batteries.map((b) => ({ id: b.id, code: b.code, name: b.name, spec: b.spec }))
	};
};
