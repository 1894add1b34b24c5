import { fail } from '@sveltejs/kit';
import { z } from 'zod';
import { requestPasswordReset } from '$lib/server/auth/password-reset';
import type { Actions } from './$types';

const schema = z.object({ email: z.string().trim().max(254).email('Enter the e-mail address of your account.') });

export const actions: Actions = {
	default: async ({ request }) => {
		const parsed = schema.safeParse(Object.fromEntries(await request.formData()));
		if (!parsed.success) return fail(400, { error: parsed.error.issues[0]?.message ?? 'Enter your e-mail address.' });
		await requestPasswordReset(parsed.data.email);
		// the same answer whether or not the address has an account
		return { sent: true };
	}
};
