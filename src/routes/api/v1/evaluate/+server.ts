import { json } from '@sveltejs/kit';
import { requirePermission } from '$lib/server/auth/guard';
import { runEvaluation } from '$lib/server/evaluation';
import type { RequestHandler } from './$types';

/** bodies above 64 KB are refused before parsing */
const MAX_EVALUATE_BODY_BYTES = 64 * 1024;

/**
 * POST /api/v1/evaluate — the public engine API (shared/DESIGN.md §4). Signed-in users only.
 * 401 signed out, 413 over 64 KB, 400 with an error per field path, 200 with the engine's answer.
 */
export const POST: RequestHandler = async (event) => {
	requirePermission(event, 'evaluate:run');
	const declared = Number(event.request.headers.get('content-length') ?? '0');
	if (declared > MAX_EVALUATE_BODY_BYTES) {
		return json({ message: 'The request body is larger than 64 KB.' }, { status: 413 });
	}
	let text: string;
	try {
		text = await event.request.text();
	} catch {
		return json({ message: 'The request body could not be read.' }, { status: 400 });
	}
	if (Buffer.byteLength(text) > MAX_EVALUATE_BODY_BYTES) {
		return json({ message: 'The request body is larger than 64 KB.' }, { status: 413 });
	}
	let body: unknown;
	try {
		body = JSON.parse(text);
	} catch {
		return json({ message: 'The body is not valid JSON.', errors: { '(body)': ['Send a JSON object.'] } }, { status: 400 });
	}
	const outcome = await runEvaluation(body);
	if (!outcome.ok) return json({ message: outcome.message, errors: outcome.errors }, { status: outcome.status });
	return json(outcome.result, { headers: { 'cache-control': 'no-store' } });
};
