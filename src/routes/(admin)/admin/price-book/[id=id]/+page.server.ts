import { error, fail, redirect } from '@sveltejs/kit';
import { requirePermission } from '$lib/server/auth/guard';
import {
	deleteDraftVersion,
	diffAgainstActive,
	getActivePriceBook,
	getCompanySettings,
	getPriceBookVersion,
	listPriceItems,
	publishVersion,
	updateDraftVersion,
	type VersionRefusal
} from '$lib/server/repositories/pricing';
import { readItemQuery } from '$lib/server/quotes/price-book-query';
import { LINE_KINDS } from '$lib/server/quotes/pricing';
import { versionSchema } from '$lib/schemas/price-book';
import { readForm } from '$lib/server/read-form';
import type { Actions, PageServerLoad } from './$types';

/** Rows of each review list shown on the page; the CSV download has them all. */
const MAX_DIFF_ROWS = 300;

export const load: PageServerLoad = async (event) => {
	requirePermission(event, 'admin:price-book');
	const version = await getPriceBookVersion(event.params.id);
	if (!version) error(404, 'There is no such price-book version.');
	const query = readItemQuery(event.url.searchParams);
	const [items, settings, active, diff] = await Promise.all([
		listPriceItems(version.id, query),
		getCompanySettings(),
		getActivePriceBook(),
		version.status === 'draft' ? diffAgainstActive(version.id) : Promise.resolve(null)
	]);
	return {
		version,
		items,
		query,
		kinds: LINE_KINDS,
		currency: settings.currency,
		timeZone: settings.timeZone,
		active,
		review: diff && {
			limit: MAX_DIFF_ROWS,
			counts: {
				added: diff.added.length,
				removed: diff.removed.length,
				changed: diff.changed.length,
				unchanged: diff.unchangedCount
			},
			added: diff.added.slice(0, MAX_DIFF_ROWS),
			removed: diff.removed.slice(0, MAX_DIFF_ROWS),
			changed: diff.changed.slice(0, MAX_DIFF_ROWS)
		},
		justUploaded: event.url.searchParams.get('uploaded') === '1'
	};
};

const UNREADABLE = {
	versionError: 'The form did not arrive whole; reload the page and try again.'
};

const PUBLISHED =
	'This version is published, and published versions cannot be changed or deleted: quotes were priced on it. Upload a new CSV to make a draft instead.';

function refused(reason: VersionRefusal | 'empty') {
	if (reason === 'not-found') error(404, 'There is no such price-book version.');
	if (reason === 'empty')
		return fail(400, {
			versionError: 'This draft has no items; upload a CSV with prices instead.'
		});
	return fail(409, { versionError: PUBLISHED });
}

export const actions: Actions = {
	/** Rename a draft or move its effective date. */
	update: async (event) => {
		requirePermission(event, 'admin:price-book');
		const form = await readForm(event.request);
		if (!form) return fail(400, UNREADABLE);
		const values = {
			label: String(form.get('label') ?? '').slice(0, 500),
			effectiveDate: String(form.get('effectiveDate') ?? '').slice(0, 50)
		};
		const parsed = versionSchema.safeParse(values);
		if (!parsed.success) {
			const fieldErrors: Record<string, string> = {};
			for (const issue of parsed.error.issues) fieldErrors[String(issue.path[0])] ??= issue.message;
			return fail(400, { update: { values, fieldErrors } });
		}
		const result = await updateDraftVersion(event.params.id, parsed.data);
		if (!result.ok) return refused(result.reason);
		return { updated: true };
	},

	/** Make the draft the active price book (archives the one before); needs the confirm field. */
	publish: async (event) => {
		const user = requirePermission(event, 'admin:price-book');
		const form = await readForm(event.request);
		if (!form) return fail(400, UNREADABLE);
		if (form.get('confirm') !== 'publish') {
			return fail(400, {
				versionError:
					'Confirm that you want to publish: open “Publish…” and press the confirm button.'
			});
		}
		const result = await publishVersion(event.params.id, user.id);
		if (!result.ok) return refused(result.reason);
		redirect(303, `/admin/price-book?published=${event.params.id}`);
	},

	/** Delete a draft and its items; needs the confirm field. */
	delete: async (event) => {
		requirePermission(event, 'admin:price-book');
		const form = await readForm(event.request);
		if (!form) return fail(400, UNREADABLE);
		if (form.get('confirm') !== 'delete') {
			return fail(400, {
				versionError:
					'Confirm that you want to delete the draft: open “Delete…” and press the confirm button.'
			});
		}
		const result = await deleteDraftVersion(event.params.id);
		if (!result.ok) return refused(result.reason);
		redirect(303, '/admin/price-book?deleted=1');
	}
};
