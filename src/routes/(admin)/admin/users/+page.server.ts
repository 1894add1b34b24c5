import { fail } from '@sveltejs/kit';
import { superValidate, message, setError } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { userCreateSchema, userUpdateSchema } from '$lib/schemas/auth';
import { requirePermission } from '$lib/server/auth/guard';
import {
	countActiveAdmins,
	createUser,
	EmailTakenError,
	emailTaken,
	listTeams,
	listUsers,
	updateUser
} from '$lib/server/repositories/users';
import type { Actions, PageServerLoad } from './$types';

const createAdapter = zod4(userCreateSchema);
const updateAdapter = zod4(userUpdateSchema);

export const load: PageServerLoad = async (event) => {
	requirePermission(event, 'admin:users');
	const [users, teams] = await Promise.all([listUsers(), listTeams()]);
	return { users, teams, createForm: await superValidate(createAdapter) };
};

export const actions: Actions = {
	create: async (event) => {
		requirePermission(event, 'admin:users');
		const form = await superValidate(event.request, createAdapter);
		const password = form.data.password;
		form.data.password = '';
		if (!form.valid) return fail(400, { createForm: form });
		const taken = () => setError(form, 'email', 'A user with this e-mail already exists.');
		if (await emailTaken(form.data.email)) return taken();
		try {
			await createUser({ ...form.data, password });
		} catch (err) {
			if (err instanceof EmailTakenError) return taken();
			throw err;
		}
		return message(form, `Added ${form.data.name}.`);
	},
	update: async (event) => {
		const me = requirePermission(event, 'admin:users');
		const raw = await event.request.formData();
		const parsed = userUpdateSchema.safeParse({
			id: raw.get('id'),
			role: raw.get('role'),
			teamId: raw.get('teamId') || null,
			active: raw.get('active') === 'on' || raw.get('active') === 'true'
		});
		if (!parsed.success) return fail(400, { updateError: 'Choose a valid role and team.' });
		if (parsed.data.id === me.id && (parsed.data.role !== 'admin' || !parsed.data.active)) {
			return fail(400, { updateError: 'You cannot remove your own admin access.' });
		}
		if ((parsed.data.role !== 'admin' || !parsed.data.active) && (await countActiveAdmins()) <= 1) {
			const users = await listUsers();
			const target = users.find((u) => u.id === parsed.data.id);
			if (target?.role === 'admin' && target.active) {
				return fail(400, { updateError: 'Keep at least one active admin.' });
			}
		}
		if (!(await updateUser(parsed.data))) return fail(404, { updateError: 'That user no longer exists.' });
		return { updated: parsed.data.id };
	}
};
