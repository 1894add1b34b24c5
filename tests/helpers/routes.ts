/**
 * The route tree of the app, read from `src/routes` at test time, so a test that walks it cannot
 * miss a route added later: every page, every form action and every HTTP method export.
 */
import { existsSync, readFileSync, readdirSync } from 'node:fs';
import path from 'node:path';

export const ROUTES_DIR = path.resolve('src/routes');
export const HTTP_METHODS = ['GET', 'HEAD', 'POST', 'PUT', 'PATCH', 'DELETE', 'OPTIONS'] as const;

export interface RouteInfo {
	/** SvelteKit's route id without the leading slash: `(app)/quotes/[id=id]`, '' for the root */
	id: string;
	/** the URL pattern: groups dropped, params left as `[name]` */
	pattern: string;
	/** a page (`+page.svelte` or `+page.server.ts`) answers GET */
	page: boolean;
	/** form action names of `+page.server.ts` (`default` for the unnamed one) */
	actions: string[];
	/** HTTP methods exported by `+server.ts` (`fallback` included when exported) */
	methods: string[];
	/** params in URL order, each with the key used to fill it: `<literal segment before it>/<name>` */
	params: { name: string; key: string }[];
}

function walk(dir: string, out: string[] = []): string[] {
	for (const entry of readdirSync(dir, { withFileTypes: true })) {
		const full = path.join(dir, entry.name);
		if (entry.isDirectory()) walk(full, out);
		else if (/^\+(page\.svelte|page\.server\.ts|server\.ts)$/.test(entry.name)) out.push(full);
	}
	return out;
}

/** `actions = { a: …, 'b-c': …, async d() … }`: the keys at the first indent of the object. */
export function actionNames(source: string): string[] {
	const start = source.search(/export\s+const\s+actions\b/);
	if (start < 0) return [];
	const rest = source.slice(start);
	const end = rest.search(/^\};?\s*$/m);
	const body = end < 0 ? rest : rest.slice(0, end);
	const names = [
		...body.matchAll(/^\t(?:async\s+)?(?:'([^']+)'|"([^"]+)"|([A-Za-z_$][\w$]*))\s*(?::|\()/gm)
	].map((m) => m[1] ?? m[2] ?? m[3]);
	if (names.length === 0)
		throw new Error('found `export const actions` but could not read its names');
	return names;
}

/** `export const GET`, `export async function POST`, `export function PATCH`, `export const fallback` */
export function methodNames(source: string): string[] {
	const names = [
		...source.matchAll(
			/export\s+(?:const|(?:async\s+)?function)\s+(GET|HEAD|POST|PUT|PATCH|DELETE|OPTIONS|fallback)\b/g
		)
	].map((m) => m[1]);
	if (names.length === 0) throw new Error('a +server.ts whose exported methods could not be read');
	return names;
}

export function readRoutes(dir = ROUTES_DIR): RouteInfo[] {
	const byId = new Map<string, RouteInfo>();
	for (const file of walk(dir)) {
		const id = path.relative(dir, path.dirname(file)).split(path.sep).join('/');
		let route = byId.get(id);
		if (!route) {
			const segments = id === '' ? [] : id.split('/');
			const params: RouteInfo['params'] = [];
			let literal = '';
			const urlParts: string[] = [];
			for (const seg of segments) {
				if (/^\(.*\)$/.test(seg)) continue;
				const param = /^\[{1,2}(?:\.\.\.)?([^\]=]+)(?:=[^\]]+)?\]{1,2}$/.exec(seg);
				if (param) {
					params.push({ name: param[1], key: `${literal}/${param[1]}` });
					urlParts.push(`[${param[1]}]`);
				} else {
					literal = seg;
					urlParts.push(seg);
				}
			}
			route = {
				id,
				pattern: '/' + urlParts.join('/'),
				page: false,
				actions: [],
				methods: [],
				params
			};
			byId.set(id, route);
		}
		const name = path.basename(file);
		const source = readFileSync(file, 'utf8');
		if (name === '+server.ts') route.methods = methodNames(source);
		else {
			route.page = true;
			if (name === '+page.server.ts') route.actions = actionNames(source);
		}
	}
	return [...byId.values()].sort((a, b) => a.id.localeCompare(b.id));
}

/** The URL of a route with its params filled from `values` (keyed as in `RouteInfo.params`). */
export function fillRoute(route: RouteInfo, values: Record<string, string | undefined>): string {
	let url = route.pattern;
	for (const p of route.params) {
		const value = values[p.key];
		if (value === undefined)
			throw new Error(
				`no value for the param "${p.key}" of route ${route.id}: add one to the fixture`
			);
		url = url.replace(`[${p.name}]`, encodeURIComponent(value));
	}
	return url;
}

export function routeExists(id: string, dir = ROUTES_DIR): boolean {
	return existsSync(path.join(dir, id));
}
