/** Small HTTP helpers for integration tests against the running app (APP_URL). */
export const BASE = process.env.APP_URL ?? 'http://127.0.0.1:4173';
export const DEMO_PASSWORD = 'traywise-demo';
export const DEMO = {
	rep: 'rep@demo.traywise.test',
	rep2: 'rep2@demo.traywise.test',
	manager: 'manager@demo.traywise.test',
	admin: 'admin@demo.traywise.test'
} as const;

export interface Client {
	cookie: string;
	get(path: string, init?: RequestInit): Promise<Response>;
	post(path: string, body: unknown, init?: RequestInit): Promise<Response>;
	/** a SvelteKit form action, as a browser without JavaScript would send it */
	action(path: string, fields: Record<string, string | string[]>): Promise<Response>;
}

let addressCounter = 0;
/** A fresh X-Forwarded-For-free client address is not possible; tests vary the e-mail instead. */
export function uniqueEmail(prefix = 'user'): string {
	return `${prefix}-${Date.now()}-${addressCounter++}@test.traywise.test`;
}

/**
 * A client of the app at `base` (default APP_URL). Every app process behind a load balancer shares
 * one public origin, so the Origin header is always APP_URL's, whichever process answers.
 */
export function client(cookie = '', base = BASE): Client {
	const headers = (extra?: HeadersInit) => {
		const h = new Headers(extra);
		if (cookie) h.set('cookie', cookie);
		h.set('origin', BASE);
		return h;
	};
	return {
		cookie,
		get: (path, init) => fetch(base + path, { redirect: 'manual', ...init, headers: headers(init?.headers) }),
		post: (path, body, init) =>
			fetch(base + path, {
				method: 'POST',
				redirect: 'manual',
				...init,
				headers: headers({ 'content-type': 'application/json', accept: 'application/json', ...(init?.headers ?? {}) }),
				body: typeof body === 'string' ? body : JSON.stringify(body)
			}),
		action: (path, fields) => {
			const form = new URLSearchParams();
			for (const [k, v] of Object.entries(fields)) for (const one of [v].flat()) form.append(k, one);
			return fetch(base + path, {
				method: 'POST',
				redirect: 'manual',
				headers: headers({ 'content-type': 'application/x-www-form-urlencoded', accept: 'text/html' }),
				body: form
			});
		}
	};
}

/** Signs in through the real /login form action; returns the session cookie or null. */
export async function signInCookie(email: string, password = DEMO_PASSWORD, base = BASE): Promise<string | null> {
	const res = await client('', base).action('/login', { email, password });
	const set = res.headers.getSetCookie().find((c) => c.startsWith('traywise_session='));
	if (res.status !== 303 || !set) return null;
	return set.split(';')[0];
}

export async function signIn(email: string, password = DEMO_PASSWORD, base = BASE): Promise<Client> {
	const cookie = await signInCookie(email, password, base);
	if (!cookie) throw new Error(`could not sign in as ${email}`);
	return client(cookie, base);
}
