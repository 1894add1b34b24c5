import { error, fail, redirect } from '@sveltejs/kit';
import { superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { requirePermission } from '$lib/server/auth/guard';
import { STEP_SCHEMAS, SURVEY_STEPS, parseDraftStep, type DataStep, type SurveyStep } from '$lib/schemas/survey';
import { buildEvaluateBody } from '$lib/survey-input';
import { contactsOfCustomer, getSurvey, saveStep, setCurrentStep } from '$lib/server/repositories/surveys';
import type { Actions, PageServerLoad } from './$types';

const adapters = {
	site: zod4(STEP_SCHEMAS.site),
	fleet: zod4(STEP_SCHEMAS.fleet),
	operation: zod4(STEP_SCHEMAS.operation),
	equipment: zod4(STEP_SCHEMAS.equipment),
	charging: zod4(STEP_SCHEMAS.charging),
	notes: zod4(STEP_SCHEMAS.notes)
} satisfies Record<DataStep, unknown>;

/**
 * Answers a form starts with before the rep gives them: empty. Left to superforms they would be a
 * 0 or the first choice, which looks like an answer, and autosave would send it.
 */
const NOT_ANSWERED: Record<DataStep, readonly string[]> = {
	site: [],
	fleet: ['trucks'],
	operation: ['shiftsPerDay', 'hoursPerShift', 'daysPerWeek', 'duty', 'energyKwhPerHour', 'charging'],
	equipment: [],
	charging: [],
	notes: []
};
const formDefaults = Object.fromEntries(
	Object.entries(adapters).map(([step, adapter]) => [
		step,
		{ ...adapter.defaults, ...Object.fromEntries(NOT_ANSWERED[step as DataStep].map((k) => [k, undefined])) }
	])
) as unknown as Record<DataStep, Record<string, unknown>>;

function neighbours(step: SurveyStep) {
	const i = SURVEY_STEPS.indexOf(step);
	return { prev: SURVEY_STEPS[i - 1] ?? null, next: SURVEY_STEPS[i + 1] ?? null };
}

export const load: PageServerLoad = async ({ parent, params }) => {
	const { survey } = await parent();
	const step = params.step as SurveyStep;
	if (step === 'review') {
		const built = buildEvaluateBody(survey.data);
		return { step, form: null, missing: built.ok ? [] : built.missing, contacts: [], ...neighbours(step) };
	}
	const dataStep = step as DataStep;
	const stored = (survey.data[dataStep] ?? {}) as Record<string, unknown>;
	const [form, contacts] = await Promise.all([
		superValidate(stored as never, adapters[dataStep] as never, { errors: false, defaults: formDefaults[dataStep] as never }),
		// the customer's people, offered for "Who showed you the site"
		step === 'site' ? contactsOfCustomer(survey.customerId) : Promise.resolve([])
	]);
	return { step, form, missing: [] as string[], contacts, ...neighbours(step) };
};

async function saveAndMove(event: Parameters<Actions[string]>[0], direction: 'next' | 'back') {
	const user = requirePermission(event, 'survey:edit');
	const found = await getSurvey(event.params.id!, user);
	if (!found.ok) error(found.status, found.status === 404 ? 'No such survey.' : 'This survey belongs to another team.');
	const step = event.params.step as SurveyStep;
	const { prev, next } = neighbours(step);
	const target = direction === 'next' ? next : prev;

	if (step === 'review') {
		if (direction === 'next') redirect(303, `/surveys/${event.params.id}/recommendation`);
		redirect(303, `/surveys/${event.params.id}/${prev}`);
	}
	const dataStep = step as DataStep;
	const posted = await event.request.formData().catch(() => new FormData());
	const form = await superValidate(posted, adapters[dataStep] as never, { defaults: formDefaults[dataStep] as never });
	// whatever is typed is kept, even when the step is not complete yet; an answer out of range or
	// malformed is left out on its own (the form shows why), never the whole step. The wizard sends
	// its whole form as JSON; a plain form post keeps only the fields it has (the others would be
	// superforms' defaults, not answers).
	const data = form.data as Record<string, unknown>;
	const sent = posted.has('__superform_json') ? data : Object.fromEntries(Object.entries(data).filter(([k]) => posted.has(k)));
	const loose = parseDraftStep(dataStep, sent);
	if (Object.keys(loose.values).length) await saveStep(event.params.id!, dataStep, loose.values);
	if (direction === 'next' && !form.valid) return fail(400, { form });
	await setCurrentStep(event.params.id!, target ?? step);
	redirect(303, `/surveys/${event.params.id}/${target ?? step}`);
}

export const actions: Actions = {
	next: (event) => saveAndMove(event, 'next'),
	back: (event) => saveAndMove(event, 'back')
};
