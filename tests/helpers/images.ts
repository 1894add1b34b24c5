/** Small image files made byte by byte for tests (no image library needed). */
import { crc32, deflateSync } from 'node:zlib';

function chunk(type: string, body: Uint8Array): Buffer {
	const head = Buffer.alloc(8);
	head.writeUInt32BE(body.length, 0);
	head.write(type, 4, 'ascii');
	const crc = Buffer.alloc(4);
	crc.writeUInt32BE(crc32(Buffer.concat([head.subarray(4), body])), 0);
	return Buffer.concat([head, body, crc]);
}

/**
 * An RGBA PNG of `width` × `height` whose pixels come from `paint(x, y)` → [r, g, b, a];
 * by default a teal badge with a pale band, so a preview is visibly a picture.
 */
export function makePng(
	width: number,
	height: number,
	paint: (x: number, y: number) => [number, number, number, number] = (x, y) =>
		Math.abs(y - height / 2) < height / 6
			? [238, 250, 248, 255]
			: x < width / 4
				? [217, 119, 6, 255]
				: [28, 96, 93, 255]
): Buffer {
	const ihdr = Buffer.alloc(13);
	ihdr.writeUInt32BE(width, 0);
	ihdr.writeUInt32BE(height, 4);
	ihdr[8] = 8; // bit depth
	ihdr[9] = 6; // RGBA
	const raw = Buffer.alloc(height * (1 + width * 4));
	for (let y = 0; y < height; y++) {
		const row = y * (1 + width * 4);
		raw[row] = 0; // filter: none
		for (let x = 0; x < width; x++) raw.set(paint(x, y), row + 1 + x * 4);
	}
	return Buffer.concat([
		Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
		chunk('IHDR', ihdr),
		chunk('IDAT', deflateSync(raw)),
		chunk('IEND', Buffer.alloc(0))
	]);
}

/** The marker skeleton of a baseline JPEG of `width` × `height` (enough for header checks). */
export function makeJpegSkeleton(width: number, height: number): Buffer {
	const sof = Buffer.from([
		0xff, 0xc0, 0x00, 0x11, 0x08, 0, 0, 0, 0, 0x03, 1, 0x22, 0, 2, 0x11, 1, 3, 0x11, 1
	]);
	sof.writeUInt16BE(height, 5);
	sof.writeUInt16BE(width, 7);
	return Buffer.concat([
		Buffer.from([0xff, 0xd8]),
		Buffer.from([0xff, 0xe0, 0x00, 0x10, 0x4a, 0x46, 0x49, 0x46, 0x00, 1, 1, 0, 0, 1, 0, 1, 0, 0]),
		sof,
		Buffer.from([
			0xff, 0xda, 0x00, 0x0c, 0x03, 1, 0, 2, 0x11, 3, 0x11, 0x00, 0x3f, 0x00, 0x12, 0x34
		]),
		Buffer.from([0xff, 0xd9])
	]);
}
