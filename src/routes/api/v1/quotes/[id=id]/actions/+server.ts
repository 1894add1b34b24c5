import { error, json } from '@sveltejs/kit';
import { requirePermission } from '$lib/server/auth/guard';
import { can } from '$lib/server/auth/permissions';
import { quoteActionSchema } from '$lib/schemas/quote';
import { fieldErrors } from '$lib/server/evaluation';
import { ACTION_PERMISSION, act } from '$lib/server/quotes/workflow';
import { getQuote } from '$lib/server/repositories/quotes';
import { readJsonBody } from '$lib/server/json-body';
import type { RequestHandler } from './$types';

/** The quote's state and history (JSON). */
export const GET: RequestHandler = async (event) => {
	const user = requirePermission(event, 'quote:read');
	const found = await getQuote(event.params.id, user);
	if (!found.ok) error(found.status, found.status === 404 ? 'No such quote.' : 'This quote belongs to another team.');
	const q = found.value;
	return json({ id: q.id, number: q.revision.number, revision: q.revision.revision, state: q.revision.state, events: q.events });
};

/** `{ action, comment? }` — a state change, decided by the one transitions module. 409 when refused. */
export const POST: RequestHandler = async (event) => {
	const user = requirePermission(event, 'quote:read');
	const body = await readJsonBody(event.request, 16 * 1024);
	if (!body.ok) return body.response;
	const parsed = quoteActionSchema.safeParse(body.value);
	if (!parsed.success) return json({ message: 'Unknown action.', errors: fieldErrors(parsed.error.issues) }, { status: 400 });
	if (!can(user.role, ACTION_PERMISSION[parsed.data.action])) return json({ message: 'Your role does not allow this.' }, { status: 403 });
	const done = await act(event.params.id, { user, role: user.role }, parsed.data.action, { comment: parsed.data.comment });
	if (!done.ok) return json({ message: done.message }, { status: done.status });
	return json(done.value);
};
