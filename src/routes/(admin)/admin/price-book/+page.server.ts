import { fail, redirect } from '@sveltejs/kit';
import { requirePermission } from '$lib/server/auth/guard';
import {
	createDraftVersion,
	getActivePriceBook,
	getCompanySettings,
	listPriceBookVersions,
	listPriceItems
} from '$lib/server/repositories/pricing';
import { parsePriceBookCsv, type PriceBookError } from '$lib/server/quotes/price-book-csv';
import { readItemQuery } from '$lib/server/quotes/price-book-query';
import { LINE_KINDS } from '$lib/server/quotes/pricing';
import { readForm } from '$lib/server/read-form';
import { MAX_PRICE_BOOK_BYTES, versionSchema } from '$lib/schemas/price-book';
import type { Actions, PageServerLoad } from './$types';

/** Problems listed on the page after a refused upload; the count says how many there were in all. */
const MAX_PROBLEMS_SHOWN = 200;

export const load: PageServerLoad = async (event) => {
	requirePermission(event, 'admin:price-book');
	const query = readItemQuery(event.url.searchParams);
	const [versions, active, settings] = await Promise.all([
		listPriceBookVersions(),
		getActivePriceBook(),
		getCompanySettings()
	]);
	const items = active ? await listPriceItems(active.id, query) : null;
	const publishedId = event.url.searchParams.get('published');
	return {
		versions,
		activeVersion: active ? (versions.find((v) => v.id === active.id) ?? null) : null,
		items,
		query,
		kinds: LINE_KINDS,
		currency: settings.currency,
		timeZone: settings.timeZone,
		today: new Date().toISOString().slice(0, 10),
		maxUploadBytes: MAX_PRICE_BOOK_BYTES,
		justPublished: publishedId ? (versions.find((v) => v.id === publishedId)?.label ?? null) : null,
		justDeleted: event.url.searchParams.get('deleted') === '1'
	};
};

interface UploadFailure {
	values: { label: string; effectiveDate: string };
	fileName: string | null;
	fieldErrors: { label?: string; effectiveDate?: string; file?: string };
	problems: PriceBookError[];
	problemCount: number;
}

function uploadFailure(
	status: number,
	failure: Partial<UploadFailure> & Pick<UploadFailure, 'values'>
) {
	const problems = failure.problems ?? [];
	return fail(status, {
		upload: {
			values: failure.values,
			fileName: failure.fileName ?? null,
			fieldErrors: failure.fieldErrors ?? {},
			problems: problems.slice(0, MAX_PROBLEMS_SHOWN),
			problemCount: problems.length
		} satisfies UploadFailure
	});
}

function text(value: FormDataEntryValue | null): string {
	return typeof value === 'string' ? value : '';
}

/** a file name for display only: no paths, no control characters, not too long */
function shownName(name: string): string {
	// eslint-disable-next-line no-control-regex
	const base =
		name
			.split(/[\\/]/)
			.pop()
			?.replace(/[\u0000-\u001f\u007f-\u009f]/g, '') ?? '';
	return base.length > 80 ? `${base.slice(0, 77)}…` : base;
}

const megabytes = (bytes: number) => `${(bytes / (1024 * 1024)).toFixed(1)} MB`;

export const actions: Actions = {
	/**
	 * A CSV becomes a new draft version: all rows or none. The body is read whole before its size is
	 * checked (BODY_SIZE_LIMIT caps it): answering before reading it breaks the browser's connection
	 * instead of showing the message.
	 */
	upload: async (event) => {
		const user = requirePermission(event, 'admin:price-book');
		const empty = { values: { label: '', effectiveDate: '' } };
		const form = await readForm(event.request);
		if (!form) {
			return uploadFailure(400, {
				...empty,
				fieldErrors: {
					file: 'The upload did not arrive as a form with a file; choose the CSV file and try again.'
				}
			});
		}
		const values = {
			label: text(form.get('label')).slice(0, 500),
			effectiveDate: text(form.get('effectiveDate')).slice(0, 50)
		};
		const fieldErrors: UploadFailure['fieldErrors'] = {};
		const parsed = versionSchema.safeParse(values);
		if (!parsed.success) {
			for (const issue of parsed.error.issues) {
				const field = issue.path[0] as 'label' | 'effectiveDate';
				fieldErrors[field] ??= issue.message;
			}
		}

		const file = form.get('file');
		const fileName = file instanceof File && file.name ? shownName(file.name) : null;
		let problems: PriceBookError[] = [];
		let tooLarge = false;
		let items: ReturnType<typeof parsePriceBookCsv> | null = null;
		if (!(file instanceof File) || file.size === 0) {
			fieldErrors.file =
				file instanceof File && file.name
					? `${fileName} is empty; choose the CSV file with the prices.`
					: 'Choose the CSV file to upload.';
		} else if (file.size > MAX_PRICE_BOOK_BYTES) {
			tooLarge = true;
			fieldErrors.file = `${fileName ?? 'The file'} is ${megabytes(file.size)}; a price-book file may be at most 2 MB.`;
		} else {
			let csv: string | null = null;
			try {
				csv = new TextDecoder('utf-8', { fatal: true }).decode(await file.arrayBuffer());
			} catch {
				fieldErrors.file = `${fileName ?? 'The file'} is not text in UTF-8; save it from your spreadsheet as “CSV UTF-8” and upload it again.`;
			}
			if (csv !== null) {
				items = parsePriceBookCsv(csv);
				if (!items.ok) problems = items.errors;
			}
		}

		if (
			Object.keys(fieldErrors).length > 0 ||
			problems.length > 0 ||
			!items?.ok ||
			!parsed.success
		) {
			return uploadFailure(tooLarge ? 413 : 400, { values, fileName, fieldErrors, problems });
		}
		const id = await createDraftVersion({
			label: parsed.data.label,
			effectiveDate: parsed.data.effectiveDate,
			createdBy: user.id,
			items: items.items.map(({ sku, description, kind, listCents, costCents }) => ({
				sku,
				description,
				kind,
				listCents,
				costCents
			}))
		});
		// the draft's page shows the review against the active version
		redirect(303, `/admin/price-book/${id}?uploaded=1`);
	}
};
