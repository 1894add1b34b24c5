import { json } from '@sveltejs/kit';
import { requirePermission } from '$lib/server/auth/guard';
import { runEvaluation } from '$lib/server/evaluation';
import { readJsonBody } from '$lib/server/json-body';
import type { RequestHandler } from './$types';

/** bodies above 64 KB are refused before parsing */
const MAX_EVALUATE_BODY_BYTES = 64 * 1024;

/**
 * POST /api/v1/evaluate — the public engine API (shared/DESIGN.md §4). Signed-in users only.
 * 401 signed out, 413 over 64 KB, 400 with an error per field path, 200 with the engine's answer.
 */
export const POST: RequestHandler = async (event) => {
	requirePermission(event, 'evaluate:run');
	const body = await readJsonBody(event.request, MAX_EVALUATE_BODY_BYTES);
	if (!body.ok) return body.response;
	const outcome = await runEvaluation(body.value);
	if (!outcome.ok) return json({ message: outcome.message, errors: outcome.errors }, { status: outcome.status });
	return json(outcome.result, { headers: { 'cache-control': 'no-store' } });
};
