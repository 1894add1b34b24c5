import { describe, expect, it } from 'vitest';
import { readJsonBody } from './json-body';
import { unstorableText } from './storable-text';

const post = (body: string, headers: Record<string, string> = {}) =>
	new Request('http://127.0.0.1/api', {
		method: 'POST',
		body,
		headers: { 'content-type': 'application/json', ...headers }
	});

describe('readJsonBody', () => {
	it('gives back the parsed value', async () => {
		expect(await readJsonBody(post('{"a":[1,"x"]}'), 1024)).toEqual({
			ok: true,
			value: { a: [1, 'x'] }
		});
	});

	it('answers text that is not JSON with 400 and a field error on the body', async () => {
		const res = await readJsonBody(post('{"a":'), 1024);
		expect(res.ok).toBe(false);
		if (res.ok) return;
		expect(res.response.status).toBe(400);
		expect(await res.response.json()).toEqual({
			message: 'The body is not valid JSON.',
			errors: { '(body)': ['Send a JSON object.'] }
		});
	});

	it('answers a body over the limit with 413, after reading it all (else the client sees a reset)', async () => {
		let pulled = 0;
		const chunk = new TextEncoder().encode('x'.repeat(512));
		const body = new ReadableStream<Uint8Array>({
			pull(controller) {
				if (pulled++ < 8) controller.enqueue(chunk);
				else controller.close();
			}
		});
		const req = new Request('http://127.0.0.1/api', {
			method: 'POST',
			body,
			duplex: 'half'
		} as RequestInit);
		const res = await readJsonBody(req, 1024);
		expect(res.ok).toBe(false);
		if (!res.ok) expect(res.response.status).toBe(413);
		// all eight chunks (4 KB) were read, though only 1 KB would ever be kept
		expect(pulled).toBe(9);
	});

	it('names each field holding a NUL or a lone surrogate, "__proto__" included', async () => {
		const res = await readJsonBody(
			post('{"site":{"name":"a\\u0000b"},"notes":["ok","\\ud800"],"__proto__":"\\udfff"}'),
			1024
		);
		expect(res.ok).toBe(false);
		if (res.ok) return;
		expect(res.response.status).toBe(400);
		const body = await res.response.json();
		expect(Object.keys(body.errors).sort()).toEqual(['__proto__', 'notes.1', 'site.name']);
	});
});

describe('unstorableText', () => {
	it('passes whole surrogate pairs, right-to-left marks and markup', () => {
		expect(unstorableText({ a: '🔋 \u202Eabc <script>', b: ['שלום'] })).toEqual([]);
	});

	it('finds a NUL in a key', () => {
		expect(unstorableText({ ok: 1, ['k\u0000']: 2 })).toEqual(['k?']);
	});
});
