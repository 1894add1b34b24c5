import { requireUser } from '$lib/server/auth/guard';
import { navFor } from '$lib/server/nav';
import type { LayoutServerLoad } from './$types';

export const load: LayoutServerLoad = (event) => {
	const user = requireUser(event);
	return { user, nav: navFor(user.role) };
};
