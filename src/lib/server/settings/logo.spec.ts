import { describe, expect, it } from 'vitest';
import { inspectLogo, MAX_LOGO_BYTES, MAX_LOGO_SIDE_PX } from './logo';
import { makeJpegSkeleton, makePng } from '../../../../tests/helpers/images';

describe('inspectLogo', () => {
	it('accepts a sound PNG and reports its size', () => {
		expect(inspectLogo(makePng(40, 20))).toEqual({
			ok: true,
			ext: 'png',
			mime: 'image/png',
			widthPx: 40,
			heightPx: 20
		});
	});

	it('accepts a JPEG with a frame header and an end marker', () => {
		expect(inspectLogo(makeJpegSkeleton(300, 120))).toEqual({
			ok: true,
			ext: 'jpg',
			mime: 'image/jpeg',
			widthPx: 300,
			heightPx: 120
		});
	});

	it('goes by the bytes: text, a GIF and a PDF are refused whatever they are called', () => {
		for (const bytes of [
			Buffer.from('not an image at all'),
			Buffer.from('GIF89a\x01\x00\x01\x00', 'latin1'),
			Buffer.from('%PDF-1.7\n', 'latin1')
		]) {
			const result = inspectLogo(bytes);
			expect(result.ok).toBe(false);
			if (!result.ok) expect(result.message).toContain('PNG or JPEG');
		}
	});

	it('refuses an empty file and one over 2 MB (2 × 1024 × 1024 bytes)', () => {
		expect(inspectLogo(new Uint8Array(0))).toMatchObject({
			ok: false,
			message: expect.stringContaining('empty')
		});
		const big = Buffer.concat([makePng(4, 4), Buffer.alloc(MAX_LOGO_BYTES)]);
		expect(inspectLogo(big)).toMatchObject({
			ok: false,
			message: expect.stringContaining('limit is 2 MB')
		});
	});

	it('refuses a PNG cut short, one with a bad checksum and one whose data does not unpack', () => {
		const png = makePng(8, 8);
		expect(inspectLogo(png.subarray(0, png.length - 20))).toMatchObject({
			ok: false,
			message: expect.stringContaining('damaged')
		});
		const flipped = Buffer.from(png);
		flipped[45] ^= 0xff; // inside the IDAT chunk's data
		expect(inspectLogo(flipped)).toMatchObject({
			ok: false,
			message: expect.stringContaining('checksum')
		});
	});

	it('refuses a PNG whose image data is shorter than its header promises', () => {
		// an 8 × 8 header over the data of a 4 × 4 image, with valid checksums
		const small = makePng(4, 4);
		const header = makePng(8, 8).subarray(0, 33);
		const forged = Buffer.concat([header, small.subarray(33)]);
		expect(inspectLogo(forged)).toMatchObject({
			ok: false,
			message: expect.stringContaining('wrong size')
		});
	});

	it(`refuses an image wider than ${MAX_LOGO_SIDE_PX} px`, () => {
		const result = inspectLogo(makeJpegSkeleton(MAX_LOGO_SIDE_PX + 1, 10));
		expect(result).toMatchObject({
			ok: false,
			message: expect.stringContaining('2,500 pixels or fewer')
		});
	});

	it('refuses a JPEG without its end marker', () => {
		const jpeg = makeJpegSkeleton(10, 10);
		expect(inspectLogo(jpeg.subarray(0, jpeg.length - 2))).toMatchObject({
			ok: false,
			message: expect.stringContaining('cut short')
		});
	});
});
