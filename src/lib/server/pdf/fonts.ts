import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';

const require = createRequire(import.meta.url);

/**
 * The app's shipped typeface (Inter, from @fontsource/inter) as WOFF bytes — pdfkit embeds WOFF but
 * not WOFF2. Read once per process: embedding from bytes in memory keeps each document fast.
 */
function load(weight: 400 | 600 | 700): Buffer {
	return readFileSync(require.resolve(`@fontsource/inter/files/inter-latin-${weight}-normal.woff`));
}

let cache: { regular: Buffer; semibold: Buffer; bold: Buffer } | null = null;
export function fonts() {
	cache ??= { regular: load(400), semibold: load(600), bold: load(700) };
	return cache;
}

/** pdfkit document fonts registered under our names */
export function registerFonts(doc: PDFKit.PDFDocument): void {
	const f = fonts();
	doc.registerFont('Body', f.regular);
	doc.registerFont('Semi', f.semibold);
	doc.registerFont('Bold', f.bold);
}

const BIDI_CONTROLS = /[\u200e\u200f\u202a-\u202e\u2066-\u2069]/g;

/**
 * Text from users, made safe to print: bidirectional control characters (which could reorder what a
 * reader sees) are shown as visible code points, and characters outside the shipped Latin face
 * become "?" so nothing prints as an invisible box. Markup is never interpreted: PDF text is text.
 */
export function printable(text: string): string {
	return text
		.replace(BIDI_CONTROLS, (c) => `[U+${c.codePointAt(0)!.toString(16).toUpperCase().padStart(4, '0')}]`)
		.replace(/[^\u0009\u000a\u000d\u0020-\u007e\u00a0-\u024f\u2010-\u2027\u2030-\u205e\u20ac\u2190-\u21ff\u2212\u00b2\u00b3\u00b0\u00d7\u2122\u2264\u2265]/gu, '?');
}
