/**
 * Checking an uploaded dealer logo before it is stored. Pure (node:zlib only, no I/O).
 *
 * The type comes from the bytes, never the name or the browser's claim: PNG starts with
 * `89 50 4E 47 0D 0A 1A 0A`, JPEG with `FF D8 FF`. Beyond the signature the file's structure is
 * checked, because the quote PDF embeds the logo and a damaged image must be refused here, at
 * upload, with a message — not discovered when a quote is sent:
 * - PNG: every chunk's CRC, a valid IHDR first, a palette when the image is indexed, image data,
 *   IEND last, and image data that inflates to exactly the size the header promises;
 * - JPEG: a frame header (SOF) with its size and 1, 3 or 4 colour components, and the end marker.
 * The longest side is capped at MAX_LOGO_SIDE_PX, so a small file cannot claim a huge image.
 */
import { crc32, inflateSync } from 'node:zlib';

/** Largest logo file, bytes (2 MiB). */
export const MAX_LOGO_BYTES = 2 * 1024 * 1024;
/** Longest side of a logo, pixels: it prints a few centimetres wide, so this is plenty. */
export const MAX_LOGO_SIDE_PX = 2500;

export type LogoCheck =
	| {
			ok: true;
			ext: 'png' | 'jpg';
			mime: 'image/png' | 'image/jpeg';
			widthPx: number;
			heightPx: number;
	  }
	| { ok: false; message: string };

const PNG_SIGNATURE = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a];

const NEITHER =
	'Upload the logo as a PNG or JPEG image; this file is neither (Traywise checks the contents, not the name).';

function megabytes(bytes: number): string {
	return `${(bytes / (1024 * 1024)).toFixed(1)} MB`;
}

function u32(bytes: Uint8Array, at: number): number {
	return ((bytes[at] << 24) | (bytes[at + 1] << 16) | (bytes[at + 2] << 8) | bytes[at + 3]) >>> 0;
}
function u16(bytes: Uint8Array, at: number): number {
	return (bytes[at] << 8) | bytes[at + 1];
}
function ascii(bytes: Uint8Array, at: number, length: number): string {
	return String.fromCharCode(...bytes.subarray(at, at + length));
}

function sideProblem(width: number, height: number): string | null {
	if (width < 1 || height < 1)
		return 'This image has no size; save it again and upload the new file.';
	if (Math.max(width, height) > MAX_LOGO_SIDE_PX)
		return `The logo is ${width} × ${height} pixels; make its longest side ${MAX_LOGO_SIDE_PX.toLocaleString('en-US')} pixels or fewer.`;
	return null;
}

/** channels per colour type, and the bit depths the PNG specification allows for it */
const PNG_COLOUR_TYPES: Record<number, { channels: number; depths: number[] }> = {
	0: { channels: 1, depths: [1, 2, 4, 8, 16] },
	2: { channels: 3, depths: [8, 16] },
	3: { channels: 1, depths: [1, 2, 4, 8] },
	4: { channels: 2, depths: [8, 16] },
	6: { channels: 4, depths: [8, 16] }
};

/** bytes of filtered image data a PNG of this header holds (one filter byte per row and pass) */
function pngDataSize(
	width: number,
	height: number,
	bitsPerPixel: number,
	interlaced: boolean
): number {
	const rows = (w: number, h: number) =>
		w > 0 && h > 0 ? h * (1 + Math.ceil((w * bitsPerPixel) / 8)) : 0;
	if (!interlaced) return rows(width, height);
	const passes = [
		[0, 0, 8, 8],
		[4, 0, 8, 8],
		[0, 4, 4, 8],
		[2, 0, 4, 4],
		[0, 2, 2, 4],
		[1, 0, 2, 2],
		[0, 1, 1, 2]
	];
	return passes.reduce(
		(sum, [x0, y0, dx, dy]) =>
			sum + rows(Math.ceil((width - x0) / dx), Math.ceil((height - y0) / dy)),
		0
	);
}

function inspectPng(bytes: Uint8Array): LogoCheck {
	const damaged = (why: string): LogoCheck => ({
		ok: false,
		message: `This PNG is damaged (${why}); save it again and upload the new file.`
	});
	let at = 8;
	let header: {
		width: number;
		height: number;
		depth: number;
		colourType: number;
		interlaced: boolean;
	} | null = null;
	let palette = false;
	const data: Uint8Array[] = [];
	let ended = false;
	while (at < bytes.length) {
		if (at + 12 > bytes.length) return damaged('it is cut short');
		const length = u32(bytes, at);
		const type = ascii(bytes, at + 4, 4);
		if (length > bytes.length - at - 12) return damaged('it is cut short');
		const body = bytes.subarray(at + 8, at + 8 + length);
		if (crc32(bytes.subarray(at + 4, at + 8 + length)) !== u32(bytes, at + 8 + length))
			return damaged(`the ${/^[A-Za-z]{4}$/.test(type) ? type : 'a'} chunk fails its checksum`);
		if (!header && type !== 'IHDR') return damaged('it does not start with a header');
		if (type === 'IHDR') {
			if (header || length !== 13) return damaged('its header is malformed');
			const colourType = body[9];
			const spec = PNG_COLOUR_TYPES[colourType];
			if (
				!spec ||
				!spec.depths.includes(body[8]) ||
				body[10] !== 0 ||
				body[11] !== 0 ||
				body[12] > 1
			)
				return damaged('its header names an unknown format');
			header = {
				width: u32(body, 0),
				height: u32(body, 4),
				depth: body[8],
				colourType,
				interlaced: body[12] === 1
			};
			const side = sideProblem(header.width, header.height);
			if (side) return { ok: false, message: side };
		} else if (type === 'PLTE') palette = true;
		else if (type === 'IDAT') data.push(body);
		else if (type === 'IEND') {
			ended = true;
			break;
		}
		at += 12 + length;
	}
	if (!header) return damaged('it has no header');
	if (!ended) return damaged('it is cut short');
	if (data.length === 0) return damaged('it holds no image data');
	if (header.colourType === 3 && !palette) return damaged('its colour palette is missing');
	const bitsPerPixel = PNG_COLOUR_TYPES[header.colourType].channels * header.depth;
	const expected = pngDataSize(header.width, header.height, bitsPerPixel, header.interlaced);
	try {
		const raw = inflateSync(Buffer.concat(data), { maxOutputLength: expected + 1 });
		if (raw.length !== expected) return damaged('its image data is the wrong size');
	} catch {
		return damaged('its image data does not unpack');
	}
	return {
		ok: true,
		ext: 'png',
		mime: 'image/png',
		widthPx: header.width,
		heightPx: header.height
	};
}

/** start-of-frame markers (all but DHT C4, JPG C8 and DAC CC), which carry the image's size */
const SOF = new Set([0xc0, 0xc1, 0xc2, 0xc3, 0xc5, 0xc6, 0xc7, 0xc9, 0xca, 0xcb, 0xcd, 0xce, 0xcf]);

function inspectJpeg(bytes: Uint8Array): LogoCheck {
	const damaged = (why: string): LogoCheck => ({
		ok: false,
		message: `This JPEG is damaged (${why}); save it again and upload the new file.`
	});
	let at = 2;
	while (at < bytes.length) {
		if (bytes[at] !== 0xff) return damaged('its structure is broken');
		while (bytes[at] === 0xff) at++; // fill bytes
		const marker = bytes[at++];
		if (marker === undefined) break;
		if (marker === 0x01 || (marker >= 0xd0 && marker <= 0xd7)) continue; // no length
		if (marker === 0xd9 || marker === 0xda) return damaged('it has no frame header');
		if (at + 2 > bytes.length) break;
		const length = u16(bytes, at);
		if (length < 2 || at + length > bytes.length) return damaged('it is cut short');
		if (SOF.has(marker)) {
			if (length < 8) return damaged('its frame header is malformed');
			const height = u16(bytes, at + 3);
			const width = u16(bytes, at + 5);
			const components = bytes[at + 7];
			if (![1, 3, 4].includes(components)) return damaged('it has an unusual number of colours');
			const side = sideProblem(width, height);
			if (side) return { ok: false, message: side };
			// the end-of-image marker, allowing padding zeros after it
			let end = bytes.length;
			while (end > 0 && bytes[end - 1] === 0x00) end--;
			if (end < 2 || bytes[end - 2] !== 0xff || bytes[end - 1] !== 0xd9)
				return damaged('it is cut short');
			return { ok: true, ext: 'jpg', mime: 'image/jpeg', widthPx: width, heightPx: height };
		}
		at += length;
	}
	return damaged('it is cut short');
}

/** Whether these bytes are a usable logo: a sound PNG or JPEG within the size limits. */
export function inspectLogo(bytes: Uint8Array): LogoCheck {
	if (bytes.length === 0)
		return { ok: false, message: 'Choose a logo file to upload; this one is empty.' };
	if (bytes.length > MAX_LOGO_BYTES)
		return {
			ok: false,
			message: `The logo file is ${megabytes(bytes.length)}; the limit is 2 MB. Export it smaller and try again.`
		};
	if (PNG_SIGNATURE.every((b, i) => bytes[i] === b)) return inspectPng(bytes);
	if (bytes[0] === 0xff && bytes[1] === 0xd8 && bytes[2] === 0xff) return inspectJpeg(bytes);
	return { ok: false, message: NEITHER };
}
