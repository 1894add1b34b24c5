import { fail, redirect } from '@sveltejs/kit';
import { superValidate, message } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { loginSchema } from '$lib/schemas/auth';
import { lucia } from '$lib/server/auth/lucia';
import { startPage } from '$lib/server/auth/permissions';
import { authenticate } from '$lib/server/repositories/users';
import { signInThrottle } from '$lib/server/auth/throttle';
import type { Actions, PageServerLoad } from './$types';

const adapter = zod4(loginSchema);
const WRONG = 'That e-mail and password do not match an active account.';

function safeNext(next: string | null): string | null {
	// same-site paths only: never an open redirect
	return next && /^\/(?![/\\])/.test(next) ? next : null;
}

export const load: PageServerLoad = async ({ locals, url }) => {
	if (locals.user) redirect(303, safeNext(url.searchParams.get('next')) ?? startPage(locals.user.role));
	return { form: await superValidate(adapter) };
};

export const actions: Actions = {
	default: async ({ request, cookies, url, getClientAddress }) => {
		const form = await superValidate(request, adapter);
		const password = form.data.password;
		form.data.password = ''; // never echo a password back
		if (!form.valid) return fail(400, { form });

		const keys = [`email:${form.data.email.toLowerCase()}`, `ip:${getClientAddress()}`];
		const wait = await signInThrottle.retryAfterMinutes(keys);
		if (wait > 0) {
			return message(form, `Too many sign-in attempts. Wait ${wait} minute${wait === 1 ? '' : 's'} and try again.`, {
				status: 429
			});
		}

		const user = await authenticate(form.data.email, password);
		if (!user) {
			await signInThrottle.recordFailure(keys);
			return message(form, WRONG, { status: 400 });
		}
		await signInThrottle.clear(keys[0]);

		const session = await lucia.createSession(user.id, {});
		const cookie = lucia.createSessionCookie(session.id);
		cookies.set(cookie.name, cookie.value, { path: '/', ...cookie.attributes });
		redirect(303, safeNext(url.searchParams.get('next')) ?? startPage(user.role));
	}
};
