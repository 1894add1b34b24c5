import { error } from '@sveltejs/kit';
import { requirePermission } from '$lib/server/auth/guard';
import { allPriceItems, getPriceBookVersion } from '$lib/server/repositories/pricing';
import { formatPriceBookCsv } from '$lib/server/quotes/price-book-export';
import type { RequestHandler } from './$types';

/** A version's items as CSV, in the form the upload reads, for editing and uploading again. */
export const GET: RequestHandler = async (event) => {
	requirePermission(event, 'admin:price-book');
	const version = await getPriceBookVersion(event.params.id);
	if (!version) error(404, 'There is no such price-book version.');
	const csv = formatPriceBookCsv(await allPriceItems(version.id));
	const slug =
		version.label
			.toLowerCase()
			.replace(/[^a-z0-9]+/g, '-')
			.replace(/^-|-$/g, '')
			.slice(0, 60) || 'version';
	return new Response(csv, {
		headers: {
			'content-type': 'text/csv; charset=utf-8',
			'content-disposition': `attachment; filename="price-book-${slug}-${version.effectiveDate}.csv"`,
			'cache-control': 'private, no-store'
		}
	});
};
