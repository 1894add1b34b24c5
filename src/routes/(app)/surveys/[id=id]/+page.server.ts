import { redirect } from '@sveltejs/kit';
import { SURVEY_STEPS } from '$lib/schemas/survey';
import type { PageServerLoad } from './$types';

/** Opening a survey resumes where it stopped. */
export const load: PageServerLoad = async ({ parent, params }) => {
	const { survey } = await parent();
	if (survey.chosenSetup) redirect(303, `/surveys/${params.id}/recommendation`);
	const step = (SURVEY_STEPS as readonly string[]).includes(survey.currentStep) ? survey.currentStep : 'site';
	redirect(303, `/surveys/${params.id}/${step}`);
};
