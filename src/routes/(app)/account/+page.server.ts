import { fail } from '@sveltejs/kit';
import { z } from 'zod';
import { requireUser } from '$lib/server/auth/guard';
import { authenticate, changePassword, setUnitSystem } from '$lib/server/repositories/users';
import { hashToken } from '$lib/server/auth/lucia';
import { signInThrottle } from '$lib/server/auth/throttle';
import type { Actions, PageServerLoad } from './$types';

const unitsSchema = z.object({ unitSystem: z.enum(['metric', 'imperial']) });
const passwordSchema = z
	.object({
		current: z.string().min(1, 'Enter your current password.'),
		next: z.string().min(12, 'Use at least 12 characters.').max(256),
		repeat: z.string()
	})
	.refine((v) => v.next === v.repeat, { message: 'The two new passwords differ.', path: ['repeat'] });

export const load: PageServerLoad = (event) => {
	const user = requireUser(event);
	return { unitSystem: user.unitSystem };
};

export const actions: Actions = {
	units: async (event) => {
		const user = requireUser(event);
		const parsed = unitsSchema.safeParse(Object.fromEntries(await event.request.formData()));
		if (!parsed.success) return fail(400, { units: 'Choose metric or imperial.' });
		await setUnitSystem(user.id, parsed.data.unitSystem);
		return { units: 'Saved.' };
	},
	password: async (event) => {
		const user = requireUser(event);
		const parsed = passwordSchema.safeParse(Object.fromEntries(await event.request.formData()));
		if (!parsed.success) return fail(400, { password: parsed.error.issues[0]?.message ?? 'Check the fields.' });
		// guessing the current password here counts against the same limit as at sign-in
		const keys = [`email:${user.email.toLowerCase()}`];
		const wait = await signInThrottle.retryAfterMinutes(keys);
		if (wait > 0) {
			return fail(429, { password: `Too many wrong passwords. Wait ${wait} minute${wait === 1 ? '' : 's'} and try again.` });
		}
		if (!(await authenticate(user.email, parsed.data.current))) {
			await signInThrottle.recordFailure(keys);
			return fail(400, { password: 'Your current password is not right.' });
		}
		await signInThrottle.clear(keys[0]);
		// every other session of this user ends; this one stays signed in
		await changePassword(user.id, parsed.data.next, event.locals.session ? hashToken(event.locals.session.id) : undefined);
		return { password: 'Password changed. Other devices are signed out.' };
	}
};
