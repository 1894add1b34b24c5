import { error } from '@sveltejs/kit';
import { checkLink } from '$lib/server/quotes/customer-view';
import { revisionPdf } from '$lib/server/repositories/quotes';
import type { RequestHandler } from './$types';

/** The PDF exactly as sent (the same bytes every time). */
export const GET: RequestHandler = async ({ params }) => {
	const link = await checkLink(params.token);
	const stored = await revisionPdf(link.revisionId);
	if (!stored) error(404, 'The document is not available.');
	return new Response(new Uint8Array(stored.pdf), {
		headers: {
			'content-type': 'application/pdf',
			'content-disposition': `attachment; filename="${stored.number}.pdf"`,
			'cache-control': 'private, no-store',
			etag: `"${stored.sha256}"`
		}
	});
};
