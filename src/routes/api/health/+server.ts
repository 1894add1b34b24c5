import { json } from '@sveltejs/kit';
import { databaseIsUp } from '$lib/server/db';
import type { RequestHandler } from './$types';

/** Public liveness: `{ status, db }`, 503 when the database does not answer. */
export const GET: RequestHandler = async () => {
	const up = await databaseIsUp();
	return json(
		{ status: up ? 'ok' : 'degraded', db: up ? 'ok' : 'down' },
		{ status: up ? 200 : 503, headers: { 'cache-control': 'no-store' } }
	);
};
