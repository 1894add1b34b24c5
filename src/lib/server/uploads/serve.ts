import type { UploadRecord } from '../repositories/uploads';
import { contentDisposition, nameWithExtension } from './names';
import { readStoredFile } from './store';

/**
 * The HTTP answer for a stored upload or its thumbnail, or null when there is none. The type
 * comes from the bytes checked at upload; images are shown inline in a locked-down document.
 */
export async function uploadResponse(
	record: UploadRecord,
	which: 'original' | 'thumb',
	ifNoneMatch: string | null
): Promise<Response | null> {
	const thumb = which === 'thumb';
	if (thumb && !record.thumbName) return null;
	const etag = `"${record.sha256.slice(0, 32)}${thumb ? '-t' : ''}"`;
	const mime = thumb ? 'image/webp' : record.mime;
	const ext = (thumb ? record.thumbName : record.storedName)?.split('.').pop() ?? 'bin';
	const base = thumb ? record.name.replace(/\.[^.]*$/, '') + ' (thumbnail)' : record.name;
	const headers = new Headers({
		'content-type': mime,
		'content-disposition': contentDisposition('inline', nameWithExtension(base, ext)),
		'x-content-type-options': 'nosniff',
		'cache-control': 'private, max-age=3600',
		'cross-origin-resource-policy': 'same-origin',
		etag
	});
	// a PDF needs the browser's viewer; an image needs nothing but itself
	if (mime.startsWith('image/')) headers.set('content-security-policy', "default-src 'none'; img-src 'self'; style-src 'unsafe-inline'; sandbox");
	if (ifNoneMatch && ifNoneMatch.split(',').some((t) => t.trim() === etag)) {
		return new Response(null, { status: 304, headers });
	}
	const bytes = await readStoredFile(record, which);
	if (!bytes) return null;
	headers.set('content-length', String(bytes.length));
	return new Response(new Uint8Array(bytes), { status: 200, headers });
}
