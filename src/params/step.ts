import type { ParamMatcher } from '@sveltejs/kit';
import { SURVEY_STEPS } from '$lib/schemas/survey';

export const match: ParamMatcher = (param) => (SURVEY_STEPS as readonly string[]).includes(param);
