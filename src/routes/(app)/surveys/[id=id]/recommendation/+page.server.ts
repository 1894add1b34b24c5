import { error, fail, redirect } from '@sveltejs/kit';
import { requirePermission } from '$lib/server/auth/guard';
import { chooseSetupSchema } from '$lib/schemas/survey';
import { buildEvaluateBody } from '$lib/survey-input';
import { runEvaluation } from '$lib/server/evaluation';
import { chooseSetup, getSurvey } from '$lib/server/repositories/surveys';
import { createQuoteFromSurvey } from '$lib/server/quotes/workflow';
import { can } from '$lib/server/auth/permissions';
import { randomUUID } from 'node:crypto';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ parent, locals }) => {
	const { survey } = await parent();
	const quoteToken = randomUUID();
	const canQuote = !!locals.user && can(locals.user.role, 'quote:edit');
	const built = buildEvaluateBody(survey.data);
	if (!built.ok) return { missing: built.missing, result: null, input: null, errors: null, quoteToken, canQuote };
	// the engine's sentences give figures in the user's own system first
	const outcome = await runEvaluation({ ...built.body, units: locals.user?.unitSystem ?? 'metric' });
	if (!outcome.ok) return { missing: [], result: null, input: null, errors: outcome.errors, quoteToken, canQuote };
	return { missing: [], result: outcome.result, input: outcome.input, errors: null, quoteToken, canQuote };
};

export const actions: Actions = {
	choose: async (event) => {
		const user = requirePermission(event, 'survey:edit');
		const found = await getSurvey(event.params.id, user);
		if (!found.ok) error(found.status, found.status === 404 ? 'No such survey.' : 'This survey belongs to another team.');
		const parsed = chooseSetupSchema.safeParse(Object.fromEntries(await event.request.formData()));
		if (!parsed.success) return fail(400, { chooseError: 'Choose one of the four setups.' });
		// the server asks the engine again: the stored answer never comes from the browser
		const built = buildEvaluateBody(found.value.data);
		if (!built.ok) return fail(400, { chooseError: `The survey is not complete: ${built.missing.join(', ')}.` });
		const outcome = await runEvaluation({ ...built.body, units: user.unitSystem });
		if (!outcome.ok) return fail(400, { chooseError: outcome.message });
		const setup = outcome.result.setups.find((s) => s.id === parsed.data.setup);
		if (!setup || setup.verdict === 'does-not-fit') {
			return fail(400, { chooseError: 'That setup does not fit this truck and site; choose one that fits.' });
		}
		await chooseSetup(event.params.id, user, parsed.data.setup, outcome.result, outcome.input);
		redirect(303, `/surveys/${event.params.id}/recommendation?chosen=1`);
	}
,
	quote: async (event) => {
		const user = requirePermission(event, 'quote:edit');
		const form = await event.request.formData();
		const token = form.get('clientToken');
		const made = await createQuoteFromSurvey(event.params.id, user, typeof token === 'string' && /^[0-9a-f-]{36}$/.test(token) ? token : null);
		if (!made.ok) return fail(made.status, { chooseError: made.message });
		redirect(303, `/quotes/${made.value}`);
	}
};
