/**
 * Decodes the form-encoded bodies the payment SDK sends, with bracketed keys
 * (`line_items[0][price_data][unit_amount]=1999`, `expand[]=x`), into nested objects and arrays.
 */
export type FormValue = string | FormValue[] | { [key: string]: FormValue };

const FORBIDDEN = new Set(['__proto__', 'prototype', 'constructor']);

function parsePath(key: string): string[] | null {
	const match = /^([^[\]]+)((?:\[[^[\]]*\])*)$/.exec(key);
	if (!match) return null;
	const rest = [...match[2].matchAll(/\[([^[\]]*)\]/g)].map((m) => m[1]);
	return [match[1], ...rest];
}

export function parseFormBody(body: string): Record<string, FormValue> {
	const root: Record<string, FormValue> = {};
	for (const [key, value] of new URLSearchParams(body)) {
		const path = parsePath(key);
		if (!path || path.some((p) => FORBIDDEN.has(p))) continue;
		let node: Record<string, FormValue> | FormValue[] = root;
		for (let i = 0; i < path.length; i++) {
			const segment = path[i];
			const last = i === path.length - 1;
			const nextIsIndex = !last && /^\d*$/.test(path[i + 1]);
			if (Array.isArray(node)) {
				const index = segment === '' ? node.length : Number(segment);
				if (!Number.isInteger(index) || index > 1000) break;
				if (last) node[index] = value;
				else {
					node[index] ??= nextIsIndex ? [] : {};
					node = node[index] as Record<string, FormValue> | FormValue[];
				}
			} else {
				if (last) node[segment] = value;
				else {
					const existing = node[segment];
					if (existing === undefined || typeof existing === 'string') node[segment] = nextIsIndex ? [] : {};
					node = node[segment] as Record<string, FormValue> | FormValue[];
				}
			}
		}
	}
	return root;
}
