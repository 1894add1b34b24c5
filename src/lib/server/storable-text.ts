// NUL cannot be stored in a PostgreSQL text or jsonb value, and a lone UTF-16 surrogate is not a
// character at all (jsonb refuses its escape): either would fail deep in a query as a 500.
// eslint-disable-next-line no-control-regex
const UNSTORABLE = /\u0000|[\ud800-\udbff](?![\udc00-\udfff])|(?<![\ud800-\udbff])[\udc00-\udfff]/;

/** Paths (`a.b.0.c`) of strings in a parsed JSON value, object keys included, that PostgreSQL cannot store. */
export function unstorableText(value: unknown, path: string[] = [], out: string[] = []): string[] {
	if (out.length >= 20) return out;
	if (typeof value === 'string') {
		if (UNSTORABLE.test(value)) out.push(path.join('.') || '(body)');
	} else if (Array.isArray(value)) {
		value.forEach((v, i) => unstorableText(v, [...path, String(i)], out));
	} else if (value !== null && typeof value === 'object') {
		for (const [k, v] of Object.entries(value)) {
			if (UNSTORABLE.test(k)) out.push([...path, k.replace(UNSTORABLE, '?')].join('.'));
			else unstorableText(v, [...path, k], out);
		}
	}
	return out;
}
