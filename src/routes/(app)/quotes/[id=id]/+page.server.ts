import { error, fail, redirect } from '@sveltejs/kit';
import { requirePermission } from '$lib/server/auth/guard';
import { can } from '$lib/server/auth/permissions';
import { quoteActionSchema, quoteEditSchema } from '$lib/schemas/quote';
import { getQuote } from '$lib/server/repositories/quotes';
import { getCompanySettings, listTaxRates } from '$lib/server/repositories/pricing';
import { allowedActions } from '$lib/server/quotes/states';
import { ACTION_PERMISSION, act, figures, saveDraft } from '$lib/server/quotes/workflow';
import { deliveryTrail } from '$lib/server/quotes/trail';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const user = requirePermission(event, 'quote:read');
	const rev = Number(event.url.searchParams.get('rev')) || undefined;
	const found = await getQuote(event.params.id, user, { revision: rev });
	if (!found.ok) error(found.status, found.status === 404 ? 'No such quote.' : 'This quote belongs to another team.');
	const q = found.value;
	const [settings, taxRates, trail] = await Promise.all([getCompanySettings(), listTaxRates(), deliveryTrail(q.id)]);
	const latest = q.revisions.at(-1)?.revision === q.revision.revision;
	const actions = latest
		? allowedActions(q.revision.state, user.role, {
				approvalRequired: q.revision.approvalRequired,
				now: new Date(),
				validUntil: q.revision.validUntil ? new Date(q.revision.validUntil) : new Date('9999-12-31')
			}).filter((a) => a !== 'view' && a !== 'accept' && a !== 'pay' && a !== 'expire')
		: [];
	const { priced } = figures(q.lines, q.revision, settings);
	return {
		quote: q,
		pricedLines: priced.lines.map((l) => ({ netCents: l.netCents, marginBp: l.marginBp })),
		latest,
		actions,
		canEdit: latest && can(user.role, 'quote:edit') && (q.revision.state === 'draft' || q.revision.state === 'changes-requested'),
		seeCost: can(user.role, 'quote:see-cost'),
		policy: { repDiscountAuthorityBp: settings.repDiscountAuthorityBp, marginFloorBp: settings.marginFloorBp },
		taxRates,
		trail,
		timeZone: settings.timeZone || 'UTC'
	};
};

function parsePayload(raw: FormDataEntryValue | null): unknown {
	if (typeof raw !== 'string' || raw.length > 200_000) return null;
	try {
		return JSON.parse(raw);
	} catch {
		return null;
	}
}

export const actions: Actions = {
	save: async (event) => {
		const user = requirePermission(event, 'quote:edit');
		const parsed = quoteEditSchema.safeParse(parsePayload((await event.request.formData()).get('payload')));
		if (!parsed.success) return fail(400, { error: parsed.error.issues[0]?.message ?? 'Check the lines.' });
		const d = parsed.data;
		const saved = await saveDraft(event.params.id, user, {
			overallDiscountBp: d.overallDiscountPercent,
			taxRegion: d.taxRegion || null,
			notes: d.notes,
			contactName: d.contactName,
			contactEmail: d.contactEmail,
			lines: d.lines.map((l) => ({ sku: l.sku, quantity: l.quantity, lineDiscountBp: l.discountPercent }))
		});
		if (!saved.ok) return fail(saved.status, { error: saved.message });
		return { saved: true };
	},
	act: async (event) => {
		const user = requirePermission(event, 'quote:read');
		const parsed = quoteActionSchema.safeParse(Object.fromEntries(await event.request.formData()));
		if (!parsed.success) return fail(400, { error: 'Unknown action.' });
		if (!can(user.role, ACTION_PERMISSION[parsed.data.action])) return fail(403, { error: 'Your role does not allow this.' });
		const done = await act(event.params.id, { user, role: user.role }, parsed.data.action, { comment: parsed.data.comment });
		if (!done.ok) return fail(done.status, { error: done.message });
		redirect(303, `/quotes/${event.params.id}`);
	}
};
