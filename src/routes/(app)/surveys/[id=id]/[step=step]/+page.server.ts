import { error, fail, redirect } from '@sveltejs/kit';
import { superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { requirePermission } from '$lib/server/auth/guard';
import { STEP_SCHEMAS, SURVEY_STEPS, draftStepSchema, type DataStep, type SurveyStep } from '$lib/schemas/survey';
import { buildEvaluateBody } from '$lib/survey-input';
import { getSurvey, saveStep, setCurrentStep } from '$lib/server/repositories/surveys';
import type { Actions, PageServerLoad } from './$types';

const adapters = {
	site: zod4(STEP_SCHEMAS.site),
	fleet: zod4(STEP_SCHEMAS.fleet),
	operation: zod4(STEP_SCHEMAS.operation),
	equipment: zod4(STEP_SCHEMAS.equipment),
	charging: zod4(STEP_SCHEMAS.charging),
	notes: zod4(STEP_SCHEMAS.notes)
} satisfies Record<DataStep, unknown>;

function neighbours(step: SurveyStep) {
	const i = SURVEY_STEPS.indexOf(step);
	return { prev: SURVEY_STEPS[i - 1] ?? null, next: SURVEY_STEPS[i + 1] ?? null };
}

export const load: PageServerLoad = async ({ parent, params }) => {
	const { survey } = await parent();
	const step = params.step as SurveyStep;
	if (step === 'review') {
		const built = buildEvaluateBody(survey.data);
		return { step, form: null, missing: built.ok ? [] : built.missing, ...neighbours(step) };
	}
	const stored = (survey.data[step as DataStep] ?? {}) as Record<string, unknown>;
	const form = await superValidate(stored as never, adapters[step as DataStep] as never, { errors: false });
	return { step, form, missing: [] as string[], ...neighbours(step) };
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
	const form = await superValidate(event.request, adapters[dataStep] as never);
	// whatever is typed is kept, even when the step is not complete yet
	const loose = draftStepSchema(dataStep).safeParse(form.data);
	if (loose.success) await saveStep(event.params.id!, dataStep, loose.data as Record<string, unknown>);
	if (direction === 'next' && !form.valid) return fail(400, { form });
	await setCurrentStep(event.params.id!, target ?? step);
	redirect(303, `/surveys/${event.params.id}/${target ?? step}`);
}

export const actions: Actions = {
	next: (event) => saveAndMove(event, 'next'),
	back: (event) => saveAndMove(event, 'back')
};
