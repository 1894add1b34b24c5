import { error } from '@sveltejs/kit';
import { requirePermission } from '$lib/server/auth/guard';
import { getCaughtAttachment } from '$lib/server/repositories/caught-mail';
import { isUuid } from '$lib/server/uuid';
import type { RequestHandler } from './$types';

/** A name safe for Content-Disposition: no path, no quotes or control characters. */
function dispositionName(name: string | null): { ascii: string; utf8: string } {
	const base = (name ?? 'attachment').split(/[\\/]/).pop()!.replace(/[\u0000-\u001f\u007f"]/g, '').trim() || 'attachment';
	return { ascii: base.replace(/[^\x20-\x7e]/g, '_'), utf8: encodeURIComponent(base) };
}

/** Downloads one attachment of a caught message; always as a download, never rendered inline. */
export const GET: RequestHandler = async (event) => {
	requirePermission(event, 'admin:mail');
	const { id, attachmentId } = event.params;
	const file = isUuid(id) && isUuid(attachmentId) ? await getCaughtAttachment(id, attachmentId) : null;
	if (!file) error(404, 'No such attachment.');
	const name = dispositionName(file.filename);
	return new Response(new Uint8Array(file.content), {
		headers: {
			'content-type': /^[\w.+-]+\/[\w.+-]+$/.test(file.contentType) ? file.contentType : 'application/octet-stream',
			'content-length': String(file.content.length),
			'content-disposition': `attachment; filename="${name.ascii}"; filename*=UTF-8''${name.utf8}`,
			'content-security-policy': "default-src 'none'; sandbox",
			'cache-control': 'private, no-store'
		}
	});
};
