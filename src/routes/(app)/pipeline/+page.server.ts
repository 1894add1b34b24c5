import { requirePermission } from '$lib/server/auth/guard';
import { pipelineFigures } from '$lib/server/repositories/quotes';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	requirePermission(event, 'pipeline:read');
	return { figures: await pipelineFigures() };
};
