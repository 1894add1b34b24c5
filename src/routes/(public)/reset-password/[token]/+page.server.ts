import { fail, redirect } from '@sveltejs/kit';
import { z } from 'zod';
import { completePasswordReset, resetTokenUser } from '$lib/server/auth/password-reset';
import type { Actions, PageServerLoad } from './$types';

const schema = z
	.object({ password: z.string().min(12, 'Use at least 12 characters.').max(256), repeat: z.string() })
	.refine((v) => v.password === v.repeat, { message: 'The two passwords differ.', path: ['repeat'] });

export const load: PageServerLoad = async ({ params }) => ({ valid: (await resetTokenUser(params.token)) !== null });

export const actions: Actions = {
	default: async ({ params, request }) => {
		const parsed = schema.safeParse(Object.fromEntries(await request.formData()));
		if (!parsed.success) return fail(400, { error: parsed.error.issues[0]?.message ?? 'Check the password.' });
		if (!(await completePasswordReset(params.token, parsed.data.password))) {
			return fail(410, { error: 'This link has expired or was already used. Ask for a new one.' });
		}
		redirect(303, '/login?reset=1');
	}
};
