import { describe, expect, it } from 'vitest';
import { sniffType } from './sniff';

const bytes = (...parts: (number[] | string)[]) =>
	Uint8Array.from(parts.flatMap((p) => (typeof p === 'string' ? Array.from(p, (c) => c.charCodeAt(0)) : p)));

// An ISO-BMFF ftyp box: size (big-endian), 'ftyp', major brand, minor version, compatible brands.
function ftyp(major: string, compatible: string[] = ['mif1'], declaredSize?: number) {
	const size = declaredSize ?? 16 + 4 * compatible.length;
	return bytes([0, 0, 0, size], 'ftyp', major, [0, 0, 0, 0], compatible.join(''), new Array(32).fill(0));
}

describe('sniffType (magic numbers)', () => {
	// signatures: JPEG/JFIF FF D8 FF; PNG spec §5.2; WebP RIFF container; PDF 1.7 §7.5.2 header;
	// HEIF ISO/IEC 23008-12 brands
	it('recognises JPEG by FF D8 FF', () => {
		expect(sniffType(bytes([0xff, 0xd8, 0xff, 0xe0, 0, 0x10], 'JFIF'))).toEqual({ mime: 'image/jpeg', ext: 'jpg' });
	});
	it('recognises PNG by its 8-byte signature', () => {
		expect(sniffType(bytes([0x89], 'PNG', [0x0d, 0x0a, 0x1a, 0x0a], 'IHDR'))).toEqual({ mime: 'image/png', ext: 'png' });
	});
	it('recognises WebP by RIFF····WEBP', () => {
		expect(sniffType(bytes('RIFF', [0x24, 0, 0, 0], 'WEBPVP8 '))).toEqual({ mime: 'image/webp', ext: 'webp' });
	});
	it('recognises PDF by %PDF-', () => {
		expect(sniffType(bytes('%PDF-1.7\n%âãÏÓ\n'))).toEqual({ mime: 'application/pdf', ext: 'pdf' });
	});
	it('recognises HEIC and HEIF by the ftyp major brand', () => {
		expect(sniffType(ftyp('heic'))?.mime).toBe('image/heic');
		expect(sniffType(ftyp('heix'))?.mime).toBe('image/heic');
		expect(sniffType(ftyp('mif1', ['heic']))).toEqual({ mime: 'image/heif', ext: 'heif' });
		expect(sniffType(ftyp('msf1'))?.mime).toBe('image/heif');
	});
	it('refuses other ftyp brands (video, AVIF)', () => {
		expect(sniffType(ftyp('isom', ['mp41']))).toBeNull();
		expect(sniffType(ftyp('avif'))).toBeNull();
	});
	it('refuses an ftyp box whose size is impossible', () => {
		expect(sniffType(ftyp('heic', ['mif1'], 8))).toBeNull();
		expect(sniffType(ftyp('heic', ['mif1'], 4096))).toBeNull();
	});
	it('refuses a truncated PNG signature, GIF, ZIP, HTML, SVG and empty input', () => {
		expect(sniffType(bytes([0x89], 'PNG', [0x0d, 0x0a]))).toBeNull();
		expect(sniffType(bytes('GIF89a'))).toBeNull();
		expect(sniffType(bytes('PK', [3, 4]))).toBeNull();
		expect(sniffType(bytes('<!doctype html><script>alert(1)</script>'))).toBeNull();
		expect(sniffType(bytes('<svg xmlns="http://www.w3.org/2000/svg"/>'))).toBeNull();
		expect(sniffType(new Uint8Array())).toBeNull();
	});
	it('does not find a PDF that starts later in the file, nor a JPEG marker with a prefix', () => {
		expect(sniffType(bytes(' %PDF-1.4'))).toBeNull();
		expect(sniffType(bytes([0, 0xff, 0xd8, 0xff]))).toBeNull();
	});
});
