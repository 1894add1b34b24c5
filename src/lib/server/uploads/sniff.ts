import type { SniffedMime } from '../../uploads';

export interface SniffedType {
	mime: SniffedMime;
	/** the extension the stored file gets */
	ext: 'jpg' | 'png' | 'webp' | 'heic' | 'heif' | 'pdf';
}

/** ISO base-media brands that mean a HEIF still image (HEVC-coded `heic`/`heix`, generic `mif1`/`msf1`). */
const HEIC_BRANDS = new Set(['heic', 'heix']);
const HEIF_BRANDS = new Set(['mif1', 'msf1']);

function ascii(bytes: Uint8Array, start: number, length: number): string {
	if (bytes.length < start + length) return '';
	let s = '';
	for (let i = start; i < start + length; i++) s += String.fromCharCode(bytes[i]);
	return s;
}

function startsWith(bytes: Uint8Array, signature: readonly number[]): boolean {
	if (bytes.length < signature.length) return false;
	return signature.every((b, i) => bytes[i] === b);
}

/**
 * The file's type from its first bytes (magic numbers), or null when it is none of the types
 * Traywise accepts. The name and the browser's claimed type are never consulted.
 *
 * Signatures: JPEG `FF D8 FF`; PNG `89 50 4E 47 0D 0A 1A 0A`; WebP `RIFF····WEBP`;
 * HEIF an ISO-BMFF `ftyp` box at offset 4 whose major brand is heic, heix, mif1 or msf1;
 * PDF `%PDF-` at offset 0.
 *
 * Written by hand rather than with a general detector: five fixed signatures are a few lines, pure
 * and synchronous, and nothing outside this list can be "recognised" by accident.
 */
export function sniffType(bytes: Uint8Array): SniffedType | null {
	if (startsWith(bytes, [0xff, 0xd8, 0xff])) return { mime: 'image/jpeg', ext: 'jpg' };
	if (startsWith(bytes, [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a])) return { mime: 'image/png', ext: 'png' };
	if (ascii(bytes, 0, 4) === 'RIFF' && ascii(bytes, 8, 4) === 'WEBP') return { mime: 'image/webp', ext: 'webp' };
	if (ascii(bytes, 0, 5) === '%PDF-') return { mime: 'application/pdf', ext: 'pdf' };
	if (ascii(bytes, 4, 4) === 'ftyp') {
		// the ftyp box must be whole and inside the file: size (big-endian) ≥ 16 bytes
		const boxSize = ((bytes[0] << 24) | (bytes[1] << 16) | (bytes[2] << 8) | bytes[3]) >>> 0;
		if (boxSize < 16 || boxSize > bytes.length) return null;
		const brand = ascii(bytes, 8, 4);
		if (HEIC_BRANDS.has(brand)) return { mime: 'image/heic', ext: 'heic' };
		if (HEIF_BRANDS.has(brand)) return { mime: 'image/heif', ext: 'heif' };
	}
	return null;
}
