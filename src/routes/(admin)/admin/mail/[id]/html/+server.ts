import { error } from '@sveltejs/kit';
import { requirePermission } from '$lib/server/auth/guard';
import { getCaughtMailHtml } from '$lib/server/repositories/caught-mail';
import { isUuid } from '$lib/server/uuid';
import type { RequestHandler } from './$types';

/**
 * The HTML part of a caught message, for the sandboxed frame on the detail page. Mail HTML is
 * untrusted: the CSP allows no script, no network requests, no forms and only our own pages to
 * frame it, and `sandbox` gives it an opaque origin even when opened directly.
 */
const CSP = [
	"default-src 'none'",
	"style-src 'unsafe-inline'",
	'img-src data: cid:',
	"font-src 'none'",
	"form-action 'none'",
	"base-uri 'none'",
	"frame-ancestors 'self'",
	'sandbox'
].join('; ');

export const GET: RequestHandler = async (event) => {
	requirePermission(event, 'admin:mail');
	const html = isUuid(event.params.id) ? await getCaughtMailHtml(event.params.id) : undefined;
	if (html === undefined) error(404, 'No caught message with that id.');
	if (html === null) error(404, 'This message has no HTML part.');
	return new Response(html, {
		headers: {
			'content-type': 'text/html; charset=utf-8',
			'content-security-policy': CSP,
			'x-frame-options': 'SAMEORIGIN',
			'cache-control': 'private, no-store',
			'referrer-policy': 'no-referrer'
		}
	});
};
