import { error } from '@sveltejs/kit';
import { requirePermission } from '$lib/server/auth/guard';
import { getLogoFile } from '$lib/server/repositories/pricing';
import type { RequestHandler } from './$types';

/** The stored dealer logo, for the preview on the settings page. */
export const GET: RequestHandler = async (event) => {
	requirePermission(event, 'admin:settings');
	const logo = await getLogoFile();
	if (!logo) error(404, 'No logo has been uploaded.');
	return new Response(new Uint8Array(logo.bytes), {
		headers: {
			'content-type': logo.mime,
			'content-length': String(logo.bytes.length),
			// the address carries the stored file name (?v=…), so a new logo is a new address
			'cache-control': 'private, max-age=86400',
			'content-security-policy': "default-src 'none'"
		}
	});
};
