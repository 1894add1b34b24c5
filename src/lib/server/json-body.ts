import { json } from '@sveltejs/kit';
import type { FieldErrors } from './evaluation';
import { unstorableText } from './storable-text';

export type JsonBody = { ok: true; value: unknown } | { ok: false; response: Response };

const NOT_JSON: FieldErrors = { '(body)': ['Send a JSON object.'] };

/**
 * The body as text, or `null` when it is over `maxBytes`. The whole body is read either way (bytes
 * past the limit are dropped as they arrive): answering before the client has finished sending
 * makes the server close the connection under it, and the client sees a reset, not the 413.
 */
async function readText(request: Request, maxBytes: number): Promise<string | null> {
	if (!request.body) return '';
	const reader = request.body.getReader();
	const chunks: Uint8Array[] = [];
	let size = 0;
	for (;;) {
		const { done, value } = await reader.read();
		if (done) break;
		size += value.byteLength;
		if (size <= maxBytes) chunks.push(value);
	}
	if (size > maxBytes) return null;
	return new TextDecoder().decode(Buffer.concat(chunks));
}

/**
 * Reads a JSON request body for an API route: 413 over `maxBytes`, 400 with field errors when it is
 * not JSON or holds text PostgreSQL cannot store. Never throws.
 */
export async function readJsonBody(request: Request, maxBytes: number): Promise<JsonBody> {
	let text: string | null;
	try {
		text = await readText(request, maxBytes);
	} catch {
		return {
			ok: false,
			response: json(
				{ message: 'The request body could not be read.', errors: NOT_JSON },
				{ status: 400 }
			)
		};
	}
	if (text === null) {
		return {
			ok: false,
			response: json(
				{ message: `The request body is larger than ${Math.round(maxBytes / 1024)} KB.` },
				{ status: 413 }
			)
		};
	}
	let value: unknown;
	try {
		value = JSON.parse(text);
	} catch {
		return {
			ok: false,
			response: json({ message: 'The body is not valid JSON.', errors: NOT_JSON }, { status: 400 })
		};
	}
	const bad = unstorableText(value);
	if (bad.length > 0) {
		// no prototype: a field named "__proto__" is a field like any other
		const errors: FieldErrors = Object.create(null);
		for (const p of bad) errors[p] = ['Remove the NUL character or broken Unicode from this text.'];
		return {
			ok: false,
			response: json({ message: 'Some text cannot be stored as it is.', errors }, { status: 400 })
		};
	}
	return { ok: true, value };
}
