import { randomUUID } from 'node:crypto';
import { fail, redirect } from '@sveltejs/kit';
import { requirePermission } from '$lib/server/auth/guard';
import { can, recordScope } from '$lib/server/auth/permissions';
import { newSurveySchema } from '$lib/schemas/survey';
import { createSurvey, customerChoices, listSurveys, siteBelongsToCustomer } from '$lib/server/repositories/surveys';
import type { Actions, PageServerLoad } from './$types';

const PAGE_SIZE = 20;

export const load: PageServerLoad = async (event) => {
	const user = requirePermission(event, 'survey:read');
	const q = (event.url.searchParams.get('q') ?? '').slice(0, 100);
	const page = Math.max(1, Math.min(10_000, Number(event.url.searchParams.get('page')) || 1));
	const [{ rows, total }, customers] = await Promise.all([
		listSurveys(user, { q, page, pageSize: PAGE_SIZE }),
		can(user.role, 'survey:edit') ? customerChoices() : Promise.resolve([])
	]);
	return {
		surveys: rows,
		total,
		page,
		pages: Math.max(1, Math.ceil(total / PAGE_SIZE)),
		q,
		customers,
		canStart: can(user.role, 'survey:edit'),
		// a rep sees their own and their team's surveys; managers and admins see every team's
		listTitle: recordScope(user.role) === 'team' ? (user.teamId ? 'Your team’s surveys' : 'Your surveys') : 'All surveys',
		clientToken: randomUUID(),
		preselect: event.url.searchParams.get('customer')
	};
};

export const actions: Actions = {
	start: async (event) => {
		const user = requirePermission(event, 'survey:edit');
		const form = Object.fromEntries(await event.request.formData());
		const parsed = newSurveySchema.safeParse({
			customerId: form.customerId || undefined,
			siteId: form.siteId || undefined
		});
		if (!parsed.success) return fail(400, { startError: parsed.error.issues[0]?.message ?? 'Choose a customer.' });
		if (parsed.data.siteId && !(await siteBelongsToCustomer(parsed.data.siteId, parsed.data.customerId))) {
			return fail(400, { startError: 'That site belongs to another customer.' });
		}
		const customers = await customerChoices();
		const customer = customers.find((c) => c.id === parsed.data.customerId);
		if (!customer) {
			return fail(400, { startError: 'That customer no longer exists.' });
		}
		if (customer.sites.length === 0) {
			// a survey is of a site: without one the rep could not get past its first step
			return fail(400, {
				startError: `${customer.name} has no site yet. Add the site first, then start the survey.`,
				addSiteFor: customer.id
			});
		}
		const token = typeof form.clientToken === 'string' && /^[0-9a-f-]{36}$/.test(form.clientToken) ? form.clientToken : null;
		const id = await createSurvey({
			customerId: parsed.data.customerId,
			siteId: parsed.data.siteId ?? null,
			owner: user,
			clientToken: token,
			today: new Date().toISOString().slice(0, 10)
		});
		redirect(303, `/surveys/${id}/site`);
	}
};
