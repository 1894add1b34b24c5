import { json } from '@sveltejs/kit';
import { z } from 'zod';
import { customerPickerQuerySchema } from '$lib/schemas/customer';
import { requirePermission } from '$lib/server/auth/guard';
import { searchCustomersForPicker } from '$lib/server/repositories/customers';
import type { RequestHandler } from './$types';

/**
 * Signed-in staff: customers whose name, account number or site town contains `q`, by name, with
 * their sites (for the survey wizard's customer picker). `limit` 1–50, default 20.
 */
export const GET: RequestHandler = async (event) => {
	requirePermission(event, 'customer:manage');
	const parsed = customerPickerQuerySchema.safeParse({
		q: event.url.searchParams.get('q') ?? undefined,
		limit: event.url.searchParams.get('limit') ?? undefined
	});
	if (!parsed.success) {
		return json(
			{ message: 'Check the query.', errors: z.flattenError(parsed.error).fieldErrors },
			{ status: 400 }
		);
	}
	const customers = await searchCustomersForPicker(parsed.data.q, parsed.data.limit);
	return json({ customers }, { headers: { 'cache-control': 'no-store' } });
};
