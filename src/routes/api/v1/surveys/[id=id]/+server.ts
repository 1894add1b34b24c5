import { error, json } from '@sveltejs/kit';
import { requirePermission } from '$lib/server/auth/guard';
import { autosaveSchema, parseDraftStep } from '$lib/schemas/survey';
import { fieldErrors } from '$lib/server/evaluation';
import { getSurvey, saveStep } from '$lib/server/repositories/surveys';
import { readJsonBody } from '$lib/server/json-body';
import type { RequestHandler } from './$types';

/** The survey as stored (resume on another device). */
export const GET: RequestHandler = async (event) => {
	const user = requirePermission(event, 'survey:read');
	const found = await getSurvey(event.params.id, user);
	if (!found.ok) error(found.status, found.status === 404 ? 'No such survey.' : 'This survey belongs to another team.');
	const s = found.value;
	return json({ id: s.id, status: s.status, currentStep: s.currentStep, version: s.version, updatedAt: s.updatedAt, data: s.data, chosenSetup: s.chosenSetup });
};

/**
 * Autosave of one wizard step: `{ step, values, version? }`. Each answer is checked on its own
 * (type and range; a half-filled step is fine) and the good ones are merged into the survey
 * atomically. 200 `{ version, updatedAt }` means every answer was stored. When some are refused the
 * answer is 400 with `errors` keyed "values.<field>" saying what to fix; the other answers are
 * stored all the same, and `version`/`updatedAt` are given when anything was.
 */
export const PATCH: RequestHandler = async (event) => {
	const user = requirePermission(event, 'survey:edit');
	const found = await getSurvey(event.params.id, user);
	if (!found.ok) error(found.status, found.status === 404 ? 'No such survey.' : 'This survey belongs to another team.');

	const raw = await readJsonBody(event.request, 256 * 1024);
	if (!raw.ok) return raw.response;
	const body = autosaveSchema.safeParse(raw.value);
	if (!body.success) {
		return json({ message: 'The save request is not in the expected shape.', errors: fieldErrors(body.error.issues) }, { status: 400 });
	}
	const { values, errors } = parseDraftStep(body.data.step, body.data.values);
	const refused = Object.keys(errors);
	const kept = Object.keys(values).length;
	if (refused.length === 0 || kept > 0) {
		const saved = await saveStep(event.params.id, body.data.step, values, { currentStep: body.data.step });
		if (refused.length === 0) return json(saved);
		return json({ ...refusal(refused.length, kept), errors: prefixed(errors), ...saved }, { status: 400 });
	}
	return json({ ...refusal(refused.length, 0), errors: prefixed(errors) }, { status: 400 });
};

function refusal(refused: number, kept: number) {
	const what = refused === 1 ? 'One answer was not saved: fix it as its message says.' : `${refused} answers were not saved: fix them as their messages say.`;
	return { message: `${what}${kept ? ' The other answers of this step were saved.' : ''}` };
}

function prefixed(errors: Record<string, string[]>): Record<string, string[]> {
	const out: Record<string, string[]> = Object.create(null);
	for (const [path, messages] of Object.entries(errors)) out[`values.${path}`] = messages;
	return out;
}
