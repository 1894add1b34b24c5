/** Longest display name kept, in characters (code points), extension included. */
export const MAX_NAME_LENGTH = 120;

// C0/C1 controls (NUL included), bidirectional overrides/isolates/marks, zero-width characters and
// the byte-order mark: none belongs in a file name, and the bidi ones can make `gpj.exe` read as
// `exe.jpg`.
const INVISIBLE = /[\u0000-\u001f\u007f-\u009f\u061c\u200b-\u200f\u202a-\u202e\u2060-\u2069\ufeff]/g;
// reserved on common file systems or meaningful in headers
const RESERVED = /[<>:"|?*]/g;

/**
 * A file name that is safe to show and to offer as a download name. For display only: stored
 * files are always named `<uuid>.<ext>` by the server.
 *
 * Keeps the last path segment (`../../etc/passwd` → `passwd`, `..\x` → `x`), drops control,
 * bidirectional and zero-width characters, replaces reserved characters with `_`, collapses
 * white space, trims dots and spaces from the ends, caps the length at {@link MAX_NAME_LENGTH}
 * characters keeping the extension, and falls back to `upload` when nothing is left.
 */
export function sanitizeFileName(raw: unknown): string {
	let name = typeof raw === 'string' ? raw : '';
	name = name.normalize('NFC').replace(/[\t\n\v\f\r]/g, ' ').replace(INVISIBLE, '');
	const lastSep = Math.max(name.lastIndexOf('/'), name.lastIndexOf('\\'));
	name = name.slice(lastSep + 1);
	name = name
		.replace(RESERVED, '_')
		.replace(/\s+/g, ' ')
		.replace(/^[\s.]+|[\s.]+$/g, '');
	if (!name) return 'upload';

	const chars = Array.from(name); // code points: never split a surrogate pair
	if (chars.length <= MAX_NAME_LENGTH) return name;
	const dot = name.lastIndexOf('.');
	const ext = dot > 0 ? Array.from(name.slice(dot)) : [];
	if (ext.length > 0 && ext.length <= 10) {
		const stem = Array.from(name.slice(0, dot)).slice(0, MAX_NAME_LENGTH - ext.length);
		return (stem.join('').replace(/[\s.]+$/, '') || 'upload') + ext.join('');
	}
	return chars.slice(0, MAX_NAME_LENGTH).join('').replace(/[\s.]+$/, '');
}

const EXTENSIONS: Record<string, string[]> = {
	jpg: ['jpg', 'jpeg', 'jpe'],
	png: ['png'],
	webp: ['webp'],
	heic: ['heic'],
	heif: ['heif', 'heic'],
	pdf: ['pdf']
};

/** The display name with an extension that matches the file's real type (appended when it differs). */
export function nameWithExtension(displayName: string, ext: string): string {
	const dot = displayName.lastIndexOf('.');
	const current = dot > 0 ? displayName.slice(dot + 1).toLowerCase() : '';
	return (EXTENSIONS[ext] ?? [ext]).includes(current) ? displayName : `${displayName}.${ext}`;
}

/**
 * A `Content-Disposition` header value (RFC 6266): an ASCII-only `filename` fallback and the exact
 * name as UTF-8 in `filename*` (RFC 8187).
 */
export function contentDisposition(type: 'inline' | 'attachment', name: string): string {
	const safe = sanitizeFileName(name);
	const fallback = safe.replace(/[^\x20-\x7e]/g, '_').replace(/["\\%;]/g, '_');
	const encoded = encodeURIComponent(safe).replace(/['()*]/g, (c) => '%' + c.charCodeAt(0).toString(16).toUpperCase());
	return `${type}; filename="${fallback}"; filename*=UTF-8''${encoded}`;
}
