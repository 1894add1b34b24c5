import { randomUUID } from 'node:crypto';
import type { Handle, HandleServerError, RequestEvent, ServerInit } from '@sveltejs/kit';
import { sequence } from '@sveltejs/kit/hooks';
import { lucia } from '$lib/server/auth/lucia';
import { building } from '$app/environment';
import '$lib/schemas/messages';
import { isDatabaseDownError, queryCounter, sequelize } from '$lib/server/db';
import { BAD_VALUE_MESSAGE, BUSY_MESSAGE, isBadValueError, isBusyError } from '$lib/server/db/bad-value';
import { startInAppMailWorker } from '$lib/server/email/worker';

export const init: ServerInit = async () => {
	try {
		await sequelize.authenticate();
	} catch (err) {
		// The app still starts; /api/health reports the database as down until it answers.
		console.error('[traywise] database not reachable at start:', (err as Error).message);
	}
	if (!building) {
		// once per process (MAIL_WORKER_IN_APP=false leaves delivery to scripts/mail-worker.ts)
		const worker = startInAppMailWorker();
		// after SIGTERM the server finishes its requests, then this: finish the mail pass, close the
		// pool (idle connections would keep the process alive for another 10 s), and the process exits
		process.once('sveltekit:shutdown', async () => {
			await worker?.stop();
			await sequelize.close().catch(() => {});
		});
	}
};

/** Reads the session cookie once into typed locals. */
const session: Handle = async ({ event, resolve }) => {
	event.locals.user = null;
	event.locals.session = null;
	const sessionId = event.cookies.get(lucia.sessionCookieName);
	if (!sessionId) return resolve(event);

	const { session, user } = await lucia.validateSession(sessionId);
	if (session?.fresh) {
		const cookie = lucia.createSessionCookie(session.id);
		event.cookies.set(cookie.name, cookie.value, { path: '/', ...cookie.attributes });
	}
	if (!session) {
		const cookie = lucia.createBlankSessionCookie();
		event.cookies.set(cookie.name, cookie.value, { path: '/', ...cookie.attributes });
	}
	event.locals.session = session ? { id: session.id, expiresAt: session.expiresAt, fresh: session.fresh } : null;
	event.locals.user = user
		? {
				id: user.id,
				email: user.email,
				name: user.name,
				role: user.role,
				teamId: user.teamId,
				unitSystem: user.unitSystem
			}
		: null;
	return resolve(event);
};

const DB_DOWN_MESSAGE = 'The database is not answering right now. Nothing was changed; try again in a moment.';

function escapeHtml(text: string): string {
	return text.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);
}

/** The page shown instead of any page while the database is away (no layout: that needs the database too). */
function databaseDownPage(path: string): string {
	return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>Traywise — database not answering</title>
</head>
<body style="margin:0;font-family:system-ui,sans-serif;background:#f8fafc;color:#0f172a">
<main style="max-width:36rem;margin:4rem auto;padding:2rem;background:#fff;border:1px solid #cbd5e1;border-radius:.5rem">
<p style="margin:0 0 .5rem;color:#475569;font-size:.875rem">Traywise · error 503</p>
<h1 style="margin:0 0 1rem;font-size:1.5rem">We cannot reach the database</h1>
<p>${DB_DOWN_MESSAGE}</p>
<p>Anything you were saving when this happened was not stored; send it again once this page loads normally.</p>
<p><a href="${escapeHtml(path)}" style="color:#115e59;font-weight:600">Try again</a></p>
</main>
</body>
</html>`;
}

/** Requests the SvelteKit client reads itself: page data for client-side navigation and enhanced form actions. */
function isClientRequest(event: RequestEvent): boolean {
	return event.url.pathname.endsWith('/__data.json') || event.request.headers.get('x-sveltekit-action') === 'true';
}

function wantsJson(event: RequestEvent): boolean {
	return event.url.pathname.startsWith('/api/') || (event.request.headers.get('accept') ?? '').includes('application/json');
}

/**
 * The 503 answer while the database is away: a plain page for browsers, `{ message }` for JSON
 * routes, and for the SvelteKit client the body it expects (an error with the same message).
 * `rendered` is the 500 SvelteKit produced for an error thrown in a load, action or endpoint.
 */
function databaseDownResponse(event: RequestEvent, rendered?: Response): Response {
	const headers = new Headers({ 'retry-after': '5', 'cache-control': 'no-store' });
	const renderedType = rendered?.headers.get('content-type') ?? '';
	if (rendered && (isClientRequest(event) || renderedType.startsWith('application/json'))) {
		// SvelteKit's own body already carries handleError's message in the shape its client reads
		headers.set('content-type', renderedType || 'application/json');
		return new Response(rendered.body, { status: 503, headers });
	}
	void rendered?.body?.cancel();
	if (event.request.headers.get('x-sveltekit-action') === 'true') {
		headers.set('content-type', 'application/json');
		return new Response(JSON.stringify({ type: 'error', status: 503, error: { message: DB_DOWN_MESSAGE } }), { status: 503, headers });
	}
	if (wantsJson(event) || event.url.pathname.endsWith('/__data.json')) {
		headers.set('content-type', 'application/json');
		return new Response(JSON.stringify({ message: DB_DOWN_MESSAGE }), { status: 503, headers });
	}
	headers.set('content-type', 'text/html; charset=utf-8');
	return new Response(databaseDownPage(event.url.pathname + event.url.search), { status: 503, headers });
}

/**
 * A stopped database answers 503 (page or JSON), never a 500 or a hung request: errors thrown while
 * reading the session land in the catch; errors in loads, actions and endpoints reach handleError,
 * which marks the request, and their 500 is replaced here.
 */
const databaseDown: Handle = async ({ event, resolve }) => {
	try {
		const response = await resolve(event);
		if (response.status === 500 && (event.locals as { dbDown?: boolean }).dbDown) return databaseDownResponse(event, response);
		return response;
	} catch (err) {
		if (!isDatabaseDownError(err)) throw err;
		return databaseDownResponse(event);
	}
};

/** For answers that are not pages (kit.csp covers those): JSON loads nothing and is never framed. */
const DATA_CSP = "default-src 'none'; frame-ancestors 'none'; base-uri 'none'; form-action 'none'";

const securityHeaders: Handle = async ({ event, resolve }) => {
	if (event.url.pathname.startsWith('/api/')) {
		// API routes speak JSON, errors included: SvelteKit picks the format of a thrown error from the
		// Accept header, and a browser opening an API address asks for HTML first.
		try {
			event.request.headers.set('accept', 'application/json');
		} catch {
			// immutable request headers: the JSON shape then depends on the caller's Accept
		}
	}
	let response = await resolve(event);
	try {
		response.headers.set('x-content-type-options', 'nosniff');
	} catch {
		// immutable headers (a proxied fetch response): copy them once
		response = new Response(response.body, response);
		response.headers.set('x-content-type-options', 'nosniff');
	}
	// a route that sets its own framing rule (the caught-mail preview, framed by our own page) keeps it
	if (!response.headers.has('x-frame-options')) response.headers.set('x-frame-options', 'DENY');
	response.headers.set('referrer-policy', 'strict-origin-when-cross-origin');
	response.headers.set('permissions-policy', 'camera=(self), microphone=(), geolocation=()');
	if (
		!response.headers.has('content-security-policy') &&
		(response.headers.get('content-type') ?? '').startsWith('application/json')
	) {
		response.headers.set('content-security-policy', DATA_CSP);
	}
	response.headers.delete('x-powered-by');
	response.headers.delete('server');
	return response;
};

/**
 * A value PostgreSQL refused is the sender's mistake (400), and a row busy with another change a
 * conflict to retry (409): neither is a server fault (see handleError).
 */
const badValue: Handle = async ({ event, resolve }) => {
	const response = await resolve(event);
	const status = (event.locals as { refusedStatus?: number }).refusedStatus;
	if (response.status === 500 && status) {
		return new Response(response.body, { status, headers: new Headers(response.headers) });
	}
	return response;
};

/** With TRAYWISE_COUNT_QUERIES=1, every response says how many SQL statements it took. */
const countQueries: Handle = async ({ event, resolve }) => {
	if (process.env.TRAYWISE_COUNT_QUERIES !== '1') return resolve(event);
	const store = { n: 0 };
	const response = await queryCounter.run(store, () => resolve(event));
	try {
		response.headers.set('x-sql-queries', String(store.n));
	} catch {
		// immutable headers: leave them
	}
	return response;
};

export const handle = sequence(countQueries, securityHeaders, databaseDown, badValue, session);

export const handleError: HandleServerError = ({ error, event, status }) => {
	const errorId = randomUUID();
	if (isDatabaseDownError(error)) {
		(event.locals as { dbDown?: boolean }).dbDown = true;
		return { message: DB_DOWN_MESSAGE, errorId };
	}
	if (status !== 404) console.error(`[traywise] ${errorId}`, event.url.pathname, error);
	if (isBadValueError(error)) {
		(event.locals as { refusedStatus?: number }).refusedStatus = 400;
		return { message: BAD_VALUE_MESSAGE, errorId };
	}
	if (isBusyError(error)) {
		(event.locals as { refusedStatus?: number }).refusedStatus = 409;
		return { message: BUSY_MESSAGE, errorId };
	}
	return { message: status === 404 ? 'Not found.' : 'Something went wrong on our side.', errorId };
};
