import { error, json } from '@sveltejs/kit';
import { requirePermission } from '$lib/server/auth/guard';
import { autosaveSchema, draftStepSchema } from '$lib/schemas/survey';
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
 * Autosave of one wizard step: `{ step, values, version? }`. Values are type-checked field by field
 * (a half-filled step is fine); the step is merged into the survey atomically.
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
	const values = draftStepSchema(body.data.step).safeParse(body.data.values);
	if (!values.success) {
		return json(
			{ message: 'Some values are not of the right kind.', errors: fieldErrors(values.error.issues.map((i) => ({ ...i, path: ['values', ...i.path] }))) },
			{ status: 400 }
		);
	}
	const saved = await saveStep(event.params.id, body.data.step, values.data as Record<string, unknown>, { currentStep: body.data.step });
	return json(saved);
};
