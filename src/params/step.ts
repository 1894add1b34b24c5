import type { ParamMatcher } from '@sveltejs/kit';
// from the plain labels module: a matcher is in every page's first JavaScript, so it must not
// pull in the survey schemas (and zod) with it
import { SURVEY_STEPS } from '$lib/labels';

export const match: ParamMatcher = (param) => (SURVEY_STEPS as readonly string[]).includes(param);
