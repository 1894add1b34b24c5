import { json } from '@sveltejs/kit';
import type { FieldErrors } from './evaluation';
import { unstorableText } from './storable-text';

export type JsonBody = { ok: true; value: unknown } | { ok: false; response: Response };

const NOT_JSON: FieldErrors = { '(body)': ['Send a JSON object.'] };

/**
 * Reads a JSON request body for an API route: 413 over `maxBytes`, 400 with field errors when it is
 * not JSON or holds text PostgreSQL cannot store. Never throws.
 */
export async function readJsonBody(request: Request, maxBytes: number): Promise<JsonBody> {
	const tooLarge = () =>
		json(
			{ message: `The request body is larger than ${Math.round(maxBytes / 1024)} KB.` },
			{ status: 413 }
		);
	const declared = Number(request.headers.get('content-length') ?? '0');
	if (declared > maxBytes) return { ok: false, response: tooLarge() };
	let text: string;
	try {
		text = await request.text();
	} catch {
		return {
			ok: false,
			response: json(
				{ message: 'The request body could not be read.', errors: NOT_JSON },
				{ status: 400 }
			)
		};
	}
	if (Buffer.byteLength(text) > maxBytes) return { ok: false, response: tooLarge() };
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
