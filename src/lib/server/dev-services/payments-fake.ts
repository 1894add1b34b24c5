/**
 * A local stand-in for the payment provider: the few API calls Traywise makes through the official
 * SDK (create and retrieve a checkout session, retrieve a payment intent), a hosted checkout page
 * that treats the provider's documented test card numbers as the provider does, and signed
 * `checkout.session.completed` webhooks. State lives in memory; the app never depends on it (it
 * keeps its own record of every session it creates). Never started in production.
 */
import { randomBytes } from 'node:crypto';
import { createServer, type IncomingMessage, type ServerResponse } from 'node:http';
import Stripe from 'stripe';
import { parseFormBody, type FormValue } from './form-body';
import { TEST_CARDS, chargeTestCard, groupCardNumber } from './test-cards';

export interface PaymentsFakeOptions {
	port: number;
	host?: string;
	/** the API key the app must present (Bearer) */
	secretKey: string;
	/** webhooks are signed with this secret */
	webhookSecret: string;
	/** where signed events are posted */
	webhookUrl: string;
	/** the address browsers reach the hosted page at; default http://host:port */
	publicUrl?: string;
	log?: (message: string) => void;
}

export interface PaymentsFake {
	readonly port: number;
	readonly url: string;
	stop(): Promise<void>;
}

interface LineItem {
	name: string;
	unitAmount: number;
	quantity: number;
}

interface FakeSession {
	id: string;
	created: number;
	expiresAt: number;
	currency: string;
	lineItems: LineItem[];
	amountTotal: number;
	metadata: Record<string, string>;
	intentMetadata: Record<string, string>;
	successUrl: string;
	cancelUrl: string | null;
	customerEmail: string | null;
	paymentStatus: 'unpaid' | 'paid';
	completed: boolean;
	paymentIntent: string | null;
}

interface FakeIntent {
	id: string;
	created: number;
	amount: number;
	currency: string;
	metadata: Record<string, string>;
	last4: string;
}

class RequestError extends Error {
	constructor(
		readonly status: number,
		message: string,
		readonly param?: string,
		readonly type = 'invalid_request_error',
		readonly code?: string
	) {
		super(message);
	}
}

const MAX_AMOUNT = 99_999_999; // eight digits of minor units, as the provider allows
const SESSION_LIFETIME_S = 24 * 3600;

function id(prefix: string): string {
	return `${prefix}_test_${randomBytes(12).toString('base64url')}`;
}

function escapeHtml(value: string): string {
	return value.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);
}

function money(minor: number, currency: string): string {
	const format = new Intl.NumberFormat('en-US', { style: 'currency', currency: currency.toUpperCase() });
	const digits = format.resolvedOptions().maximumFractionDigits ?? 2;
	return format.format(minor / 10 ** digits);
}

function str(value: FormValue | undefined, param: string, required = true): string | null {
	if (value === undefined || value === '') {
		if (required) throw new RequestError(400, `Missing required param: ${param}.`, param);
		return null;
	}
	if (typeof value !== 'string') throw new RequestError(400, `Invalid string: ${param}.`, param);
	return value;
}

function int(value: FormValue | undefined, param: string, min: number, max: number): number {
	const s = str(value, param)!;
	if (!/^\d+$/.test(s) || Number(s) < min || Number(s) > max) {
		throw new RequestError(400, `Invalid integer: ${param} must be a whole number from ${min} to ${max}.`, param);
	}
	return Number(s);
}

function httpUrl(value: FormValue | undefined, param: string, required: boolean): string | null {
	const s = str(value, param, required);
	if (s === null) return null;
	const parsed = URL.canParse(s) ? new URL(s) : null;
	if (!parsed || (parsed.protocol !== 'http:' && parsed.protocol !== 'https:')) {
		throw new RequestError(400, `Not a valid URL: ${param}.`, param);
	}
	return s;
}

function stringMap(value: FormValue | undefined, param: string): Record<string, string> {
	if (value === undefined || value === '') return {};
	if (typeof value !== 'object' || Array.isArray(value)) throw new RequestError(400, `Invalid object: ${param}.`, param);
	const out: Record<string, string> = {};
	for (const [k, v] of Object.entries(value)) {
		if (typeof v !== 'string') throw new RequestError(400, `Invalid metadata value: ${param}[${k}].`, `${param}[${k}]`);
		out[k] = v;
	}
	return out;
}

/** Validates a checkout creation like the provider would, for the parameters Traywise uses. */
function sessionFromParams(params: Record<string, FormValue>): FakeSession {
	if (str(params.mode, 'mode') !== 'payment') throw new RequestError(400, 'This stand-in supports mode=payment only.', 'mode');
	const items = params.line_items;
	if (!Array.isArray(items) || items.length === 0) throw new RequestError(400, 'Missing required param: line_items.', 'line_items');
	let currency: string | null = null;
	const lineItems: LineItem[] = items.map((raw, i) => {
		const item = (typeof raw === 'object' && !Array.isArray(raw) ? raw : {}) as Record<string, FormValue>;
		const price = (typeof item.price_data === 'object' && !Array.isArray(item.price_data) ? item.price_data : null) as Record<
			string,
			FormValue
		> | null;
		if (!price) throw new RequestError(400, `Missing required param: line_items[${i}][price_data].`, `line_items[${i}][price_data]`);
		const itemCurrency = str(price.currency, `line_items[${i}][price_data][currency]`)!.toLowerCase();
		if (!/^[a-z]{3}$/.test(itemCurrency)) throw new RequestError(400, `Invalid currency: ${itemCurrency}.`, `line_items[${i}][price_data][currency]`);
		if (currency && currency !== itemCurrency) throw new RequestError(400, 'All line items must use the same currency.', 'line_items');
		currency = itemCurrency;
		const product = (typeof price.product_data === 'object' && !Array.isArray(price.product_data) ? price.product_data : {}) as Record<
			string,
			FormValue
		>;
		return {
			name: str(product.name, `line_items[${i}][price_data][product_data][name]`)!,
			unitAmount: int(price.unit_amount, `line_items[${i}][price_data][unit_amount]`, 0, MAX_AMOUNT),
			quantity: int(item.quantity, `line_items[${i}][quantity]`, 1, 10_000)
		};
	});
	const amountTotal = lineItems.reduce((sum, l) => sum + l.unitAmount * l.quantity, 0);
	if (amountTotal > MAX_AMOUNT) throw new RequestError(400, `Amount must be no more than ${MAX_AMOUNT} minor units.`, 'line_items');
	const email = str(params.customer_email, 'customer_email', false);
	if (email !== null && !/^[^\s@]+@[^\s@]+\.[^\s@]+$/.test(email)) throw new RequestError(400, 'Invalid email address.', 'customer_email');
	const intentData = params.payment_intent_data;
	const created = Math.floor(Date.now() / 1000);
	return {
		id: id('cs'),
		created,
		expiresAt: created + SESSION_LIFETIME_S,
		currency: currency!,
		lineItems,
		amountTotal,
		metadata: stringMap(params.metadata, 'metadata'),
		intentMetadata:
			typeof intentData === 'object' && !Array.isArray(intentData)
				? stringMap(intentData.metadata, 'payment_intent_data[metadata]')
				: {},
		successUrl: httpUrl(params.success_url, 'success_url', true)!,
		cancelUrl: httpUrl(params.cancel_url, 'cancel_url', false),
		customerEmail: email,
		paymentStatus: 'unpaid',
		completed: false,
		paymentIntent: null
	};
}

function status(session: FakeSession, now = Date.now() / 1000): 'open' | 'complete' | 'expired' {
	if (session.completed) return 'complete';
	return now >= session.expiresAt ? 'expired' : 'open';
}

function sessionJson(session: FakeSession, publicUrl: string) {
	const state = status(session);
	return {
		id: session.id,
		object: 'checkout.session',
		amount_subtotal: session.amountTotal,
		amount_total: session.amountTotal,
		cancel_url: session.cancelUrl,
		created: session.created,
		currency: session.currency,
		customer_details: session.customerEmail ? { email: session.customerEmail } : null,
		customer_email: session.customerEmail,
		expires_at: session.expiresAt,
		livemode: false,
		metadata: session.metadata,
		mode: 'payment',
		payment_intent: session.paymentIntent,
		payment_status: session.paymentStatus,
		status: state,
		success_url: session.successUrl,
		url: state === 'open' ? `${publicUrl}/pay/${session.id}` : null
	};
}

function intentJson(intent: FakeIntent) {
	return {
		id: intent.id,
		object: 'payment_intent',
		amount: intent.amount,
		amount_received: intent.amount,
		created: intent.created,
		currency: intent.currency,
		livemode: false,
		metadata: intent.metadata,
		payment_method_types: ['card'],
		status: 'succeeded'
	};
}

function readBody(req: IncomingMessage, limit = 1024 * 1024): Promise<string> {
	return new Promise((resolve, reject) => {
		const chunks: Buffer[] = [];
		let size = 0;
		req.on('data', (chunk: Buffer) => {
			size += chunk.length;
			if (size > limit) {
				reject(new RequestError(413, 'Request body too large.'));
				req.destroy();
			} else chunks.push(chunk);
		});
		req.on('end', () => resolve(Buffer.concat(chunks).toString('utf8')));
		req.on('error', reject);
	});
}

function sendJson(res: ServerResponse, code: number, body: unknown, extra: Record<string, string> = {}): void {
	res.writeHead(code, { 'content-type': 'application/json', 'request-id': id('req'), ...extra });
	res.end(JSON.stringify(body));
}

function sendError(res: ServerResponse, err: RequestError): void {
	sendJson(res, err.status, {
		error: { type: err.type, message: err.message, ...(err.param ? { param: err.param } : {}), ...(err.code ? { code: err.code } : {}) }
	});
}

interface PageState {
	message?: string;
	field?: 'number' | 'expiry' | 'cvc' | null;
	number?: string;
	expiry?: string;
}

/** The hosted checkout page: a plain form in Traywise's neutral test look. */
function checkoutPage(session: FakeSession, state: PageState = {}): string {
	const total = money(session.amountTotal, session.currency);
	const lines = session.lineItems
		.map((l) => `<li>${escapeHtml(l.name)}${l.quantity > 1 ? ` × ${l.quantity}` : ''} <span>${escapeHtml(money(l.unitAmount * l.quantity, session.currency))}</span></li>`)
		.join('');
	const invalid = (f: PageState['field']) => (state.field === f ? ' aria-invalid="true" aria-describedby="problem"' : '');
	const cards = TEST_CARDS.map((c) => `<li><code>${groupCardNumber(c.number)}</code> ${escapeHtml(c.outcome)}</li>`).join('');
	const back = session.cancelUrl
		? `<a class="back" href="${escapeHtml(session.cancelUrl)}">Go back without paying</a>`
		: '';
	return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>Pay ${escapeHtml(total)} · test checkout</title>
<style>
body{margin:0;font-family:system-ui,sans-serif;background:#f4f4f5;color:#18181b}
main{max-width:440px;margin:2rem auto;padding:0 1rem}
.panel{background:#fff;border:1px solid #d4d4d8;border-radius:10px;padding:1.25rem;margin-bottom:1rem}
.badge{display:inline-block;font-size:.75rem;font-weight:600;letter-spacing:.04em;text-transform:uppercase;background:#fef3c7;color:#78350f;border-radius:4px;padding:.15rem .4rem}
h1{font-size:1.25rem;margin:.5rem 0 0}
.total{font-size:2rem;font-weight:700;margin:.25rem 0 .75rem}
ul.lines{list-style:none;padding:0;margin:0;border-top:1px solid #e4e4e7}
ul.lines li{display:flex;justify-content:space-between;gap:1rem;padding:.5rem 0;border-bottom:1px solid #e4e4e7}
label{display:block;font-weight:600;margin:.75rem 0 .25rem}
input{box-sizing:border-box;width:100%;font-size:1.05rem;padding:.6rem;border:1px solid #71717a;border-radius:6px}
input[aria-invalid=true]{border-color:#b91c1c;outline:2px solid #fecaca}
.row{display:flex;gap:.75rem}.row>div{flex:1}
button{margin-top:1rem;width:100%;min-height:44px;font-size:1.05rem;font-weight:700;color:#fff;background:#3f3f46;border:0;border-radius:6px;cursor:pointer}
button:focus-visible,a:focus-visible,input:focus-visible{outline:3px solid #2563eb;outline-offset:2px}
.problem{border:1px solid #fca5a5;background:#fef2f2;color:#7f1d1d;border-radius:6px;padding:.75rem;margin:0 0 .5rem}
.back{display:inline-block;margin-top:1rem;color:#1d4ed8;min-height:44px;line-height:44px}
.hint{font-size:.875rem;color:#3f3f46}.hint code{font-weight:600}
</style>
</head>
<body>
<main>
<div class="panel">
<span class="badge">Test checkout · local stand-in for the payment provider</span>
<h1>Amount due</h1>
<p class="total">${escapeHtml(total)}</p>
<ul class="lines">${lines}</ul>
${session.customerEmail ? `<p>Receipt to <strong>${escapeHtml(session.customerEmail)}</strong></p>` : ''}
</div>
<form class="panel" method="post" action="/pay/${escapeHtml(session.id)}" novalidate>
${state.message ? `<p class="problem" id="problem" role="alert">${escapeHtml(state.message)}</p>` : ''}
<label for="card-number">Card number</label>
<input id="card-number" name="card_number" inputmode="numeric" autocomplete="cc-number" value="${escapeHtml(state.number ?? '')}"${invalid('number')} required>
<div class="row">
<div><label for="card-expiry">Expiry (MM / YY)</label>
<input id="card-expiry" name="expiry" inputmode="numeric" autocomplete="cc-exp" placeholder="MM / YY" value="${escapeHtml(state.expiry ?? '')}"${invalid('expiry')} required></div>
<div><label for="card-cvc">CVC</label>
<input id="card-cvc" name="cvc" inputmode="numeric" autocomplete="cc-csc"${invalid('cvc')} required></div>
</div>
<button type="submit">Pay ${escapeHtml(total)}</button>
${back}
</form>
<div class="panel hint">
<p><strong>This page is a local stand-in.</strong> No real card is charged. Use any future expiry date and any three digits as CVC with one of these test card numbers:</p>
<ul>${cards}</ul>
</div>
</main>
</body>
</html>`;
}

function messagePage(title: string, body: string): string {
	return `<!doctype html><html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1"><title>${escapeHtml(title)}</title></head><body style="font-family:system-ui,sans-serif;max-width:440px;margin:2rem auto;padding:0 1rem"><h1>${escapeHtml(title)}</h1>${body}</body></html>`;
}

/** Starts the fake; resolves once it listens. */
export function startPaymentsFake(options: PaymentsFakeOptions): Promise<PaymentsFake> {
	const host = options.host ?? '127.0.0.1';
	const publicUrl = (options.publicUrl ?? `http://${host}:${options.port}`).replace(/\/$/, '');
	const log = options.log ?? (() => {});
	const sessions = new Map<string, FakeSession>();
	const intents = new Map<string, FakeIntent>();
	const idempotency = new Map<string, { fingerprint: string; status: number; body: unknown }>();
	const pendingDeliveries = new Set<Promise<void>>();
	let stopping = false;

	async function postEvent(payload: string, eventId: string): Promise<boolean> {
		try {
			const res = await fetch(options.webhookUrl, {
				method: 'POST',
				headers: {
					'content-type': 'application/json',
					'stripe-signature': Stripe.webhooks.generateTestHeaderString({ payload, secret: options.webhookSecret })
				},
				body: payload,
				signal: AbortSignal.timeout(10_000)
			});
			log(`webhook ${eventId} → ${res.status}`);
			return res.ok;
		} catch (err) {
			log(`webhook ${eventId} not delivered: ${(err as Error).message}`);
			return false;
		}
	}

	/** Sends the event now; on failure keeps retrying in the background with back-off (1 s … 64 s). */
	async function deliver(event: Record<string, unknown>): Promise<void> {
		const payload = JSON.stringify(event, null, 2);
		if (await postEvent(payload, event.id as string)) return;
		const retry = (async () => {
			for (let attempt = 0; attempt < 7 && !stopping; attempt++) {
				await new Promise((r) => setTimeout(r, 1000 * 2 ** attempt));
				if (stopping) return;
				// re-signed each time: the signature carries a timestamp the app checks for freshness
				if (await postEvent(payload, event.id as string)) return;
			}
		})();
		pendingDeliveries.add(retry);
		void retry.finally(() => pendingDeliveries.delete(retry));
	}

	function complete(session: FakeSession, last4: string): Record<string, unknown> {
		const intent: FakeIntent = {
			id: id('pi'),
			created: Math.floor(Date.now() / 1000),
			amount: session.amountTotal,
			currency: session.currency,
			metadata: session.intentMetadata,
			last4
		};
		intents.set(intent.id, intent);
		session.completed = true;
		session.paymentStatus = 'paid';
		session.paymentIntent = intent.id;
		return {
			id: id('evt'),
			object: 'event',
			api_version: Stripe.API_VERSION,
			created: Math.floor(Date.now() / 1000),
			data: { object: sessionJson(session, publicUrl) },
			livemode: false,
			pending_webhooks: 1,
			request: { id: null, idempotency_key: null },
			type: 'checkout.session.completed'
		};
	}

	function successLocation(session: FakeSession): string {
		return session.successUrl.replaceAll('{CHECKOUT_SESSION_ID}', session.id);
	}

	function pageHeaders(session: FakeSession): Record<string, string> {
		const origins = [session.successUrl, session.cancelUrl].filter((u): u is string => !!u).map((u) => new URL(u).origin);
		return {
			'content-type': 'text/html; charset=utf-8',
			'cache-control': 'no-store',
			'x-content-type-options': 'nosniff',
			'referrer-policy': 'no-referrer',
			'content-security-policy': `default-src 'none'; style-src 'unsafe-inline'; form-action 'self' ${[...new Set(origins)].join(' ')}; frame-ancestors 'none'; base-uri 'none'`
		};
	}

	async function api(req: IncomingMessage, res: ServerResponse, path: string): Promise<void> {
		const auth = req.headers.authorization ?? '';
		if (auth !== `Bearer ${options.secretKey}`) {
			throw new RequestError(401, 'Invalid API key provided.', undefined, 'invalid_request_error', 'api_key_invalid');
		}
		if (req.method === 'POST' && path === '/v1/checkout/sessions') {
			const body = await readBody(req);
			const key = req.headers['idempotency-key'];
			const idemKey = typeof key === 'string' && key ? key : null;
			if (idemKey) {
				const seen = idempotency.get(idemKey);
				if (seen) {
					if (seen.fingerprint !== body) {
						throw new RequestError(
							400,
							'Keys for idempotent requests can only be used with the same parameters they were first used with.',
							undefined,
							'idempotency_error'
						);
					}
					return sendJson(res, seen.status, seen.body, { 'idempotent-replayed': 'true' });
				}
			}
			const session = sessionFromParams(parseFormBody(body));
			sessions.set(session.id, session);
			const out = sessionJson(session, publicUrl);
			if (idemKey) idempotency.set(idemKey, { fingerprint: body, status: 200, body: out });
			log(`created ${session.id}: ${session.amountTotal} ${session.currency}`);
			return sendJson(res, 200, out);
		}
		let match = /^\/v1\/checkout\/sessions\/([A-Za-z0-9_-]+)$/.exec(path);
		if (req.method === 'GET' && match) {
			const session = sessions.get(match[1]);
			if (!session) throw new RequestError(404, `No such checkout.session: '${match[1]}'`, 'session', 'invalid_request_error', 'resource_missing');
			return sendJson(res, 200, sessionJson(session, publicUrl));
		}
		match = /^\/v1\/payment_intents\/([A-Za-z0-9_-]+)$/.exec(path);
		if (req.method === 'GET' && match) {
			const intent = intents.get(match[1]);
			if (!intent) throw new RequestError(404, `No such payment_intent: '${match[1]}'`, 'intent', 'invalid_request_error', 'resource_missing');
			return sendJson(res, 200, intentJson(intent));
		}
		throw new RequestError(404, `Unrecognized request URL (${req.method}: ${path}). This stand-in implements only what Traywise uses.`);
	}

	async function hostedPage(req: IncomingMessage, res: ServerResponse, sessionId: string): Promise<void> {
		const session = sessions.get(sessionId);
		if (!session) {
			res.writeHead(404, { 'content-type': 'text/html; charset=utf-8' });
			return void res.end(
				messagePage('This checkout is not available', '<p>The link is unknown or the test checkout was restarted. Go back to the quote and start the payment again.</p>')
			);
		}
		const state = status(session);
		if (state === 'complete') {
			res.writeHead(303, { location: successLocation(session), 'cache-control': 'no-store' });
			return void res.end();
		}
		if (state === 'expired') {
			res.writeHead(410, { 'content-type': 'text/html; charset=utf-8' });
			const back = session.cancelUrl ? `<p><a href="${escapeHtml(session.cancelUrl)}">Go back</a> and start the payment again.</p>` : '';
			return void res.end(messagePage('This checkout has expired', back));
		}
		if (req.method === 'GET') {
			res.writeHead(200, pageHeaders(session));
			return void res.end(checkoutPage(session));
		}
		if (req.method !== 'POST') throw new RequestError(405, 'Method not allowed.');
		const form = new URLSearchParams(await readBody(req, 16 * 1024));
		const card = { number: form.get('card_number') ?? '', expiry: form.get('expiry') ?? '', cvc: form.get('cvc') ?? '' };
		const outcome = chargeTestCard(card);
		if (!outcome.ok) {
			log(`declined ${session.id}: ${outcome.code}${outcome.declineCode ? `/${outcome.declineCode}` : ''}`);
			res.writeHead(402, pageHeaders(session));
			return void res.end(
				checkoutPage(session, { message: outcome.message, field: outcome.field, number: card.number, expiry: card.expiry })
			);
		}
		const event = complete(session, outcome.last4);
		log(`paid ${session.id} with a card ending ${outcome.last4}`);
		await deliver(event);
		res.writeHead(303, { location: successLocation(session), 'cache-control': 'no-store' });
		res.end();
	}

	const server = createServer((req, res) => {
		const path = (req.url ?? '/').split('?')[0];
		const route = async () => {
			if (path.startsWith('/v1/')) return api(req, res, path);
			const page = /^\/pay\/([A-Za-z0-9_-]+)$/.exec(path);
			if (page) return hostedPage(req, res, page[1]);
			if (path === '/' && req.method === 'GET') {
				return sendJson(res, 200, { service: 'payment provider stand-in', sessions: sessions.size });
			}
			throw new RequestError(404, 'Not found.');
		};
		route().catch((err: unknown) => {
			if (res.headersSent) return res.end();
			if (err instanceof RequestError) return sendError(res, err);
			log(`fake error: ${(err as Error).stack ?? err}`);
			sendError(res, new RequestError(500, 'The stand-in failed; see its log.', undefined, 'api_error'));
		});
	});

	return new Promise((resolve, reject) => {
		server.once('error', reject);
		server.listen(options.port, host, () => {
			server.off('error', reject);
			log(`payment provider stand-in listening on ${publicUrl}`);
			resolve({
				port: options.port,
				url: publicUrl,
				stop: async () => {
					stopping = true;
					await new Promise<void>((done) => {
						server.close(() => done());
						server.closeAllConnections();
					});
					await Promise.allSettled([...pendingDeliveries]);
				}
			});
		});
	});
}
