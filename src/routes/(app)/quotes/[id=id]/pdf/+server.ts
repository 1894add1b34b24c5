import { error } from '@sveltejs/kit';
import { requirePermission } from '$lib/server/auth/guard';
import { getQuote, revisionPdf } from '$lib/server/repositories/quotes';
import { buildQuotePdf } from '$lib/server/pdf/quote-pdf';
import { pdfSettings } from '$lib/server/quotes/workflow';
import type { RequestHandler } from './$types';

/**
 * The quote's PDF for staff: the stored document of a sent revision (the same bytes every time), or
 * a marked preview of an unsent draft built on the fly (nothing stored).
 */
export const GET: RequestHandler = async (event) => {
	const user = requirePermission(event, 'quote:read');
	const rev = Number(event.url.searchParams.get('rev')) || undefined;
	const found = await getQuote(event.params.id, user, { revision: rev });
	if (!found.ok) error(found.status, found.status === 404 ? 'No such quote.' : 'This quote belongs to another team.');
	const q = found.value;
	const stored = q.revision.hasPdf ? await revisionPdf(q.revision.id) : null;
	let body: Buffer;
	let name: string;
	if (stored) {
		body = stored.pdf;
		name = `${stored.number}.pdf`;
	} else {
		body = await buildQuotePdf(q, await pdfSettings());
		name = `${q.revision.number}-preview.pdf`;
	}
	return new Response(new Uint8Array(body), {
		headers: {
			'content-type': 'application/pdf',
			'content-disposition': `inline; filename="${name}"`,
			'cache-control': 'private, no-store',
			...(stored ? { etag: `"${stored.sha256}"` } : {})
		}
	});
};
