import { randomBytes, randomUUID } from 'node:crypto';
import { QueryTypes } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
	BASE,
	DEMO,
	DEMO_PASSWORD,
	client,
	signIn,
	signInCookie,
	uniqueEmail,
	type Client
} from '../helpers/http';
import { fillRoute, readRoutes, type RouteInfo } from '../helpers/routes';
import { buildQuote, chosenSurvey, demoIds } from '../helpers/scenario';
import { makePng } from '../helpers/images';
import { mailedQuoteToken } from '../helpers/customer-link';
import { waitFor } from '../helpers/services';
import { sequelize } from '$lib/server/db';
import { CaughtMail, CaughtMailAttachment, MailOutbox } from '$lib/server/db/models/delivery';
import { Session, User } from '$lib/server/db/models';
import { enqueueMail } from '$lib/server/email/outbox';
import { removeLogo, setLogo } from '$lib/server/repositories/pricing';
import { createUser } from '$lib/server/repositories/users';
import { SIGN_IN_LIMITS } from '$lib/server/auth/throttle';

// ---------------------------------------------------------------------------------------------
// Role × route matrix (issue 7, item 5). The routes come from src/routes at test time; every page
// GET, every form action and every exported HTTP method must have a row in EXPECTED, or the
// "covers every route" test fails. Columns, in order:
//
//   out      no session
//   rep      the rep (Harbour team) who owns the survey and the quote used as params
//   rep2     a rep of another team (Upland): team scoping of surveys and quotes
//   manager  sales manager
//   admin    admin
//   customer (the customer's /q/[token] routes only) no session, the real token of a sent quote;
//            the other columns then use their cookie with the same token, and `out` a
//            well-formed token that was never issued
//
// Form actions are sent as a browser without JavaScript sends them (form-encoded, Accept:
// text/html, same Origin) with the body given, else an empty one: an allowed role then gets the
// action's own refusal (400 and a message), which proves the guard let it through, while a refused
// role gets 403 and a signed-out visitor 303 to /login. API routes get the same Accept header a
// browser navigation sends and must still answer JSON, never a redirect.
// ---------------------------------------------------------------------------------------------

const COLUMNS = ['out', 'rep', 'rep2', 'manager', 'admin'] as const;
type Column = (typeof COLUMNS)[number] | 'customer';

interface Probe {
	/** statuses in column order: "out rep rep2 manager admin [customer]" */
	expect: string;
	/** form fields for an action, or a JSON body for an API method */
	body?: Record<string, unknown>;
	/** runs after the route's other probes (it deletes or signs out what they use) */
	last?: boolean;
	/** a session of its own per column (the probe ends the session it is sent with) */
	freshSession?: boolean;
}
type Row = Record<string, string | Probe>;
interface RouteExpectation {
	probes: Row;
	/** runs before the route's probes */
	setup?: () => Promise<void>;
}

const PAGE_ALL_STAFF = '303 200 200 200 200';
const ADMIN_PAGE = '303 403 403 403 200';
const ADMIN_FORM = '303 403 403 403 400';
const STAFF_FORM = '303 400 400 400 400';

const EXPECTED: Record<string, RouteExpectation> = {
	'': { probes: { GET: '303 303 303 303 303' } },
	// no session needed, and none checked: the forms say the same to everyone
	'(public)/forgot-password': {
		probes: { GET: '200 200 200 200 200', POST: '400 400 400 400 400' }
	},
	// an unknown reset token shows the "ask for a new link" page; an empty form is refused first
	'(public)/reset-password/[token]': {
		probes: { GET: '200 200 200 200 200', POST: '400 400 400 400 400' }
	},
	'(public)/login': {
		probes: {
			GET: '200 303 303 303 303',
			// an empty form: field errors, nothing counted against the throttle; a signed-in visitor
			// is then sent on to their start page, as on GET
			POST: '400 303 303 303 303'
		}
	},
	logout: {
		probes: {
			GET: '303 303 303 303 303',
			POST: { expect: '303 303 303 303 303', freshSession: true }
		}
	},

	// pages of the (app) group
	'(app)/account': {
		probes: { GET: PAGE_ALL_STAFF, 'POST ?/units': STAFF_FORM, 'POST ?/password': STAFF_FORM }
	},
	'(app)/approvals': { probes: { GET: '303 403 403 200 403' } },
	'(app)/customers': { probes: { GET: PAGE_ALL_STAFF } },
	'(app)/customers/new': { probes: { GET: PAGE_ALL_STAFF, POST: STAFF_FORM } },
	// the customer book is shared by every staff role (DEVELOPERS.md, "Customers and uploads")
	'(app)/customers/[id=id]': { probes: { GET: PAGE_ALL_STAFF } },
	'(app)/customers/[id=id]/edit': { probes: { GET: PAGE_ALL_STAFF, POST: STAFF_FORM } },
	'(app)/customers/[id=id]/contacts/new': { probes: { GET: PAGE_ALL_STAFF, POST: STAFF_FORM } },
	'(app)/customers/[id=id]/contacts/[contactId=id]': {
		probes: { GET: PAGE_ALL_STAFF, POST: STAFF_FORM }
	},
	'(app)/customers/[id=id]/sites/new': { probes: { GET: PAGE_ALL_STAFF, POST: STAFF_FORM } },
	'(app)/customers/[id=id]/sites/[siteId=id]': {
		probes: { GET: PAGE_ALL_STAFF, POST: STAFF_FORM }
	},
	'(app)/pipeline': { probes: { GET: '303 403 403 200 200' } },
	'(app)/quotes': { probes: { GET: PAGE_ALL_STAFF } },
	'(app)/quotes/[id=id]': {
		probes: {
			GET: '303 200 403 200 200',
			'POST ?/save': '303 400 403 400 403',
			// approving is the manager's; the draft is not awaiting approval, so the manager gets 409
			'POST ?/act': { expect: '303 403 403 409 403', body: { action: 'approve' } }
		}
	},
	'(app)/quotes/[id=id]/pdf': { probes: { GET: '303 200 403 200 200' } },
	'(app)/surveys': { probes: { GET: PAGE_ALL_STAFF, 'POST ?/start': '303 400 400 400 403' } },
	// opening a survey with a chosen setup resumes on its recommendation
	'(app)/surveys/[id=id]': { probes: { GET: '303 303 403 303 303' } },
	'(app)/surveys/[id=id]/[step=step]': {
		probes: {
			GET: '303 200 403 200 200',
			'POST ?/next': '303 400 403 400 403',
			'POST ?/back': '303 303 403 303 403'
		}
	},
	'(app)/surveys/[id=id]/recommendation': {
		probes: {
			GET: '303 200 403 200 200',
			'POST ?/choose': '303 400 403 400 403',
			// builds a quote from the chosen setup: the owner and a manager may
			'POST ?/quote': '303 303 403 303 403'
		}
	},

	// admin pages
	'(admin)/admin/catalogue': { probes: { GET: '303 403 403 403 303' } },
	'(admin)/admin/catalogue/trucks': { probes: { GET: ADMIN_PAGE } },
	'(admin)/admin/catalogue/trucks/new': {
		probes: { GET: ADMIN_PAGE, 'POST ?/create': ADMIN_FORM }
	},
	'(admin)/admin/catalogue/trucks/[id=id]': {
		probes: {
			GET: ADMIN_PAGE,
			'POST ?/save': ADMIN_FORM,
			'POST ?/retire': '303 403 403 403 200',
			'POST ?/restore': '303 403 403 403 200',
			'POST ?/delete': { expect: '303 403 403 403 303', last: true }
		}
	},
	'(admin)/admin/catalogue/batteries': { probes: { GET: ADMIN_PAGE } },
	'(admin)/admin/catalogue/batteries/new': {
		probes: { GET: ADMIN_PAGE, 'POST ?/create': ADMIN_FORM }
	},
	'(admin)/admin/catalogue/batteries/[id=id]': {
		probes: {
			GET: ADMIN_PAGE,
			'POST ?/save': ADMIN_FORM,
			'POST ?/retire': '303 403 403 403 200',
			'POST ?/restore': '303 403 403 403 200',
			'POST ?/delete': { expect: '303 403 403 403 303', last: true }
		}
	},
	'(admin)/admin/catalogue/equipment': { probes: { GET: ADMIN_PAGE } },
	'(admin)/admin/catalogue/equipment/new': {
		probes: { GET: ADMIN_PAGE, 'POST ?/create': ADMIN_FORM }
	},
	'(admin)/admin/catalogue/equipment/[id=id]': {
		probes: {
			GET: ADMIN_PAGE,
			'POST ?/save': ADMIN_FORM,
			'POST ?/retire': '303 403 403 403 200',
			'POST ?/restore': '303 403 403 403 200',
			'POST ?/delete': { expect: '303 403 403 403 303', last: true }
		}
	},
	'(admin)/admin/mail': { probes: { GET: ADMIN_PAGE, 'POST ?/requeue': ADMIN_FORM } },
	'(admin)/admin/mail/[id]': { probes: { GET: ADMIN_PAGE } },
	'(admin)/admin/mail/[id]/html': { probes: { GET: ADMIN_PAGE } },
	'(admin)/admin/mail/[id]/attachments/[attachmentId]': { probes: { GET: ADMIN_PAGE } },
	'(admin)/admin/price-book': { probes: { GET: ADMIN_PAGE, 'POST ?/upload': ADMIN_FORM } },
	// the active version: every change needs fields or a confirm step the empty form lacks
	'(admin)/admin/price-book/[id=id]': {
		probes: {
			GET: ADMIN_PAGE,
			'POST ?/update': ADMIN_FORM,
			'POST ?/publish': ADMIN_FORM,
			'POST ?/delete': ADMIN_FORM
		}
	},
	'(admin)/admin/price-book/[id=id]/csv': { probes: { GET: ADMIN_PAGE } },
	'(admin)/admin/settings': {
		probes: {
			GET: ADMIN_PAGE,
			'POST ?/save': ADMIN_FORM,
			'POST ?/addTaxRate': ADMIN_FORM,
			'POST ?/updateTaxRate': ADMIN_FORM,
			// no such rate
			'POST ?/removeTaxRate': '303 403 403 403 404',
			'POST ?/logo': ADMIN_FORM,
			'POST ?/removeLogo': '303 403 403 403 200'
		}
	},
	'(admin)/admin/settings/logo': {
		setup: async () => {
			const user = (await User.findOne({ where: { email: DEMO.admin } }))!;
			const stored = await setLogo(makePng(64, 32), user.id);
			if (!stored.ok) throw new Error(stored.message);
		},
		probes: { GET: ADMIN_PAGE }
	},
	'(admin)/admin/users': {
		probes: { GET: ADMIN_PAGE, 'POST ?/create': ADMIN_FORM, 'POST ?/update': ADMIN_FORM }
	},

	// files served to staff (navigated to by the browser, so a signed-out visitor is sent to sign in)
	'uploads/[id=id]': { probes: { GET: PAGE_ALL_STAFF } },
	'uploads/[id=id]/thumb': { probes: { GET: PAGE_ALL_STAFF } },

	// JSON API: 401 signed out, 403 refused, and an empty body is a 400 with field errors
	'api/health': { probes: { GET: '200 200 200 200 200' } },
	'api/v1/admin/users': { probes: { GET: '401 403 403 403 200' } },
	'api/v1/catalogue/trucks': { probes: { GET: '401 200 200 200 200' } },
	'api/v1/catalogue/batteries': { probes: { GET: '401 200 200 200 200' } },
	'api/v1/customers': { probes: { GET: '401 200 200 200 200' } },
	'api/v1/evaluate': { probes: { POST: '401 400 400 400 400' } },
	'api/v1/surveys/[id=id]': {
		probes: { GET: '401 200 403 200 200', PATCH: '401 400 403 400 403' }
	},
	'api/v1/quotes/[id=id]/actions': {
		probes: {
			GET: '401 200 403 200 200',
			POST: { expect: '401 403 403 409 403', body: { action: 'approve' } }
		}
	},
	'api/v1/quotes/[id=id]/totals': { probes: { POST: '401 400 403 400 403' } },
	'api/v1/uploads': { probes: { POST: '401 400 400 400 400' } },
	// no session needed: the provider's signature is the guard, and an unsigned body is refused
	'api/webhooks/payments': { probes: { POST: '400 400 400 400 400' } },

	// the customer's pages (no account: the token in the link is the guard). `out` holds a
	// well-formed token that was never issued; the others the sent quote's real one.
	'q/[token]': {
		probes: {
			GET: '404 200 200 200 200 200',
			// an empty acceptance is refused; the deposit waits for an acceptance
			'POST ?/accept': '404 400 400 400 400 400',
			'POST ?/pay': '404 409 409 409 409 409',
			// the link already shows the latest revision
			'POST ?/fresh': '404 400 400 400 400 400'
		}
	},
	'q/[token]/paid': { probes: { GET: '404 200 200 200 200 200' } },
	'q/[token]/pdf': { probes: { GET: '404 200 200 200 200 200' } },
	'q/[token]/viewed': { probes: { POST: '404 204 204 204 204 204' } }
};

const routes = readRoutes();
const sessions: Record<Exclude<Column, 'out' | 'customer'>, Client> = {} as never;
const ids: Record<string, string> = {};
const run = Date.now().toString(36).toUpperCase();

function probeLabels(route: RouteInfo): string[] {
	const labels: string[] = [];
	if (route.page) labels.push('GET');
	for (const a of route.actions) labels.push(a === 'default' ? 'POST' : `POST ?/${a}`);
	for (const m of route.methods)
		if (!(route.page && m === 'GET')) labels.push(m === 'fallback' ? 'fallback' : m);
	return labels;
}

function asProbe(value: string | Probe): Probe {
	return typeof value === 'string' ? { expect: value } : value;
}

/** One request as a browser (or the app's own fetch calls) would send it. */
async function send(
	route: RouteInfo,
	label: string,
	url: string,
	cookie: string,
	body?: Record<string, unknown>
): Promise<Response> {
	const api = url.startsWith('/api/');
	const headers = new Headers({
		origin: BASE,
		accept: 'text/html,application/xhtml+xml,application/xml;q=0.9,*/*;q=0.8'
	});
	if (cookie) headers.set('cookie', cookie);
	if (label === 'GET') return fetch(BASE + url, { headers, redirect: 'manual' });
	if (label.startsWith('POST') && route.page) {
		const action = label === 'POST' ? '' : `?/${label.slice('POST ?/'.length)}`;
		headers.set('content-type', 'application/x-www-form-urlencoded');
		const form = new URLSearchParams();
		for (const [k, v] of Object.entries(body ?? {})) form.append(k, String(v));
		return fetch(BASE + url + action, { method: 'POST', headers, body: form, redirect: 'manual' });
	}
	const method = label === 'fallback' ? 'PUT' : label;
	if (api || method !== 'GET') headers.set('content-type', 'application/json');
	return fetch(BASE + url, {
		method,
		headers,
		body: method === 'GET' || method === 'HEAD' ? undefined : JSON.stringify(body ?? {}),
		redirect: 'manual'
	});
}

async function cookieFor(column: Column, fresh: boolean): Promise<string> {
	if (column === 'out' || column === 'customer') return '';
	if (!fresh) return sessions[column].cookie;
	const email = column === 'rep2' ? DEMO.rep2 : DEMO[column];
	const cookie = await signInCookie(email);
	if (!cookie) throw new Error(`could not sign in as ${email}`);
	return cookie;
}

/** Real ids from the database for every param key the route tree uses. */
async function paramValues(): Promise<Record<string, string>> {
	const demo = await demoIds();
	const surveyId = await chosenSurvey(sessions.rep);
	const quoteId = await buildQuote(sessions.rep, surveyId);
	const [contact] = await sequelize.query<{ id: string }>(
		`SELECT id FROM contacts WHERE customer_id = :id ORDER BY name LIMIT 1`,
		{
			replacements: { id: demo.customerId },
			type: QueryTypes.SELECT
		}
	);
	const [version] = await sequelize.query<{ id: string }>(
		`SELECT id FROM price_book_versions WHERE status = 'active'`,
		{
			type: QueryTypes.SELECT
		}
	);

	// a stored photo on the demo customer, through the real upload route
	const form = new FormData();
	form.append('ownerType', 'customer');
	form.append('ownerId', demo.customerId);
	form.append('kind', 'photo');
	form.append(
		'files',
		new Blob([new Uint8Array(makePng(120, 80))], { type: 'image/png' }),
		'matrix.png'
	);
	const up = await fetch(`${BASE}/api/v1/uploads`, {
		method: 'POST',
		headers: { cookie: sessions.rep.cookie, origin: BASE },
		body: form
	});
	if (up.status !== 200) throw new Error(`upload for the matrix answered ${up.status}`);
	const uploadId = (await up.json()).results[0].upload.id as string;

	// a caught message with an attachment
	const { id: outboxId } = await enqueueMail({
		kind: 'test',
		to: 'matrix@customer.test',
		subject: `Matrix ${run}`,
		text: 'Matrix check',
		html: '<p>Matrix check</p>',
		attachments: [
			{
				filename: 'sheet.pdf',
				contentType: 'application/pdf',
				content: Buffer.from('%PDF-1.4\n%%EOF\n')
			}
		]
	});
	const sent = await waitFor('mail delivered', async () => {
		const r = await MailOutbox.findByPk(outboxId);
		return r?.status === 'sent' ? r : null;
	});
	const caught = await waitFor('mail caught', () =>
		CaughtMail.findOne({ where: { messageId: sent.messageId } })
	);
	const attachment = (await CaughtMailAttachment.findOne({ where: { caughtMailId: caught.id } }))!;

	// throwaway catalogue records (the matrix retires and deletes them), copied from the demo ones
	const copy = async (sql: string) =>
		(await sequelize.query<{ id: string }>(sql, { type: QueryTypes.SELECT }))[0].id;
	const truckId = await copy(
		`INSERT INTO truck_models (code, name, family, capacity_kg, spec, price_cents, cost_cents)
		 SELECT 'MX-T-${run}', 'Matrix truck ${run}', family, capacity_kg, spec, price_cents, cost_cents FROM truck_models WHERE code = 'TW-B4-25'
		 RETURNING id`
	);
	const batteryId = await copy(
		`INSERT INTO batteries (code, name, spec, price_cents, cost_cents)
		 SELECT 'MX-B-${run}', 'Matrix battery ${run}', spec, price_cents, cost_cents FROM batteries WHERE code = 'TW-B48-775-LA'
		 RETURNING id`
	);
	const equipmentId = await copy(
		`INSERT INTO equipment (sku, kind, name, spec, price_cents, cost_cents)
		 SELECT 'MX-E-${run}', kind, 'Matrix item ${run}', spec, price_cents, cost_cents FROM equipment
		 WHERE NOT retired ORDER BY sku LIMIT 1
		 RETURNING id`
	);

	const values: Record<string, string> = {
		'customers/id': demo.customerId,
		'sites/siteId': demo.siteId,
		'contacts/contactId': contact.id,
		'surveys/id': surveyId,
		'surveys/step': 'site',
		'quotes/id': quoteId,
		'price-book/id': version.id,
		'mail/id': caught.id,
		'attachments/attachmentId': attachment.id,
		'uploads/id': uploadId,
		'trucks/id': truckId,
		'batteries/id': batteryId,
		'equipment/id': equipmentId
	};

	// the customer's link arrives by e-mail when a quote is sent: send one and read the link
	expect(
		(await sessions.rep.post(`/api/v1/quotes/${quoteId}/actions`, { action: 'mark-ready' })).status
	).toBe(200);
	expect(
		(await sessions.rep.post(`/api/v1/quotes/${quoteId}/actions`, { action: 'send' })).status
	).toBe(200);
	const token = await mailedQuoteToken(quoteId);
	if (!token) throw new Error('sending the quote queued no mail with a customer link');
	values['q/token'] = token;
	// a reset link that was never issued (requesting a real one would e-mail a demo user)
	values['reset-password/token'] = randomBytes(32).toString('base64url');
	return values;
}

beforeAll(async () => {
	sessions.rep = await signIn(DEMO.rep);
	sessions.rep2 = await signIn(DEMO.rep2);
	sessions.manager = await signIn(DEMO.manager);
	sessions.admin = await signIn(DEMO.admin);
	Object.assign(ids, await paramValues());
}, 120_000);

afterAll(async () => {
	await sequelize.query(`DELETE FROM truck_models WHERE code = :c`, {
		replacements: { c: `MX-T-${run}` }
	});
	await sequelize.query(`DELETE FROM batteries WHERE code = :c`, {
		replacements: { c: `MX-B-${run}` }
	});
	await sequelize.query(`DELETE FROM equipment WHERE sku = :c`, {
		replacements: { c: `MX-E-${run}` }
	});
	// the seed has no logo; the matrix set one for the logo route
	await removeLogo(null);
	await sequelize.close();
});

describe('role × route matrix, generated from src/routes', () => {
	it('has an expected row for every page, form action and API method in the route tree, and no stale ones', () => {
		const missing: string[] = [];
		const stale: string[] = [];
		for (const route of routes) {
			const row = EXPECTED[route.id];
			if (!row) {
				missing.push(`${route.id || '(root)'}: the whole route (${probeLabels(route).join(', ')})`);
				continue;
			}
			for (const label of probeLabels(route))
				if (!(label in row.probes)) missing.push(`${route.id}: ${label}`);
			for (const label of Object.keys(row.probes))
				if (!probeLabels(route).includes(label)) stale.push(`${route.id}: ${label}`);
		}
		for (const id of Object.keys(EXPECTED)) {
			if (!routes.some((r) => r.id === id)) stale.push(`${id}: no such route`);
		}
		expect(missing, 'routes or probes without an expected status: add them to EXPECTED').toEqual(
			[]
		);
		expect(stale, 'expected rows for routes or probes that do not exist').toEqual([]);
		// sanity: the walk found the tree (a broken walk must not make the matrix pass empty)
		expect(routes.length).toBeGreaterThan(40);
		expect(routes.some((r) => r.id === '(app)/quotes/[id=id]' && r.actions.includes('act'))).toBe(
			true
		);
		expect(
			routes.some((r) => r.id === 'api/v1/surveys/[id=id]' && r.methods.includes('PATCH'))
		).toBe(true);
	});

	for (const route of routes) {
		const row = EXPECTED[route.id];
		if (!row) continue;
		const tokenRoute = route.params.some((p) => p.key === 'q/token');
		it(`${route.id || '(root)'} → ${probeLabels(route).join(', ')}`, async () => {
			await row.setup?.();
			const problems: string[] = [];
			const labels = probeLabels(route).sort(
				(a, b) => Number(!!asProbe(row.probes[a]).last) - Number(!!asProbe(row.probes[b]).last)
			);
			for (const label of labels) {
				const probe = asProbe(row.probes[label]);
				const statuses = probe.expect.trim().split(/\s+/).map(Number);
				const columns: Column[] = tokenRoute ? [...COLUMNS, 'customer'] : [...COLUMNS];
				expect(
					statuses.length,
					`${route.id} ${label}: one status per column (${columns.join(' ')})`
				).toBe(columns.length);
				for (const [i, column] of columns.entries()) {
					const values =
						tokenRoute && column === 'out'
							? { ...ids, 'q/token': randomBytes(32).toString('base64url') }
							: ids;
					const url = fillRoute(route, values);
					const res = await send(
						route,
						label,
						url,
						await cookieFor(column, !!probe.freshSession),
						probe.body
					);
					const text = await res.text();
					const where = `${label} ${url} as ${column}`;
					if (res.status !== statuses[i]) {
						problems.push(
							`${where}: ${res.status}, expected ${statuses[i]} (${res.headers.get('location') ?? text.replace(/\s+/g, ' ').slice(0, 120)})`
						);
						continue;
					}
					if (url.startsWith('/api/')) {
						if (res.status >= 300 && res.status < 400)
							problems.push(`${where}: an API route redirected`);
						if (res.status >= 400) {
							const json = (() => {
								try {
									return JSON.parse(text) as { message?: unknown };
								} catch {
									return null;
								}
							})();
							if (
								!res.headers.get('content-type')?.includes('application/json') ||
								typeof json?.message !== 'string'
							) {
								problems.push(
									`${where}: an API error must be JSON with a message (${res.headers.get('content-type')})`
								);
							}
						}
					}
					// a signed-out visitor refused by a guard is sent to sign in and brought back
					if (column === 'out' && res.status === 303 && statuses[1] !== 303 && label === 'GET') {
						const location = res.headers.get('location') ?? '';
						if (location !== `/login?next=${encodeURIComponent(url)}`)
							problems.push(`${where}: redirected to ${location}, not to sign in`);
					}
				}
			}
			expect(problems).toEqual([]);
		});
	}

	it('answers a method a route does not export with 405, for every role, before any guard', async () => {
		const problems: string[] = [];
		let checked = 0;
		for (const route of routes.filter(
			(r) => r.methods.length > 0 && !r.methods.includes('fallback')
		)) {
			const unused = ['DELETE', 'PUT', 'PATCH', 'POST'].find((m) => !route.methods.includes(m))!;
			const url = fillRoute(route, ids);
			for (const column of COLUMNS) {
				const res = await fetch(BASE + url, {
					method: unused,
					headers: {
						origin: BASE,
						cookie: await cookieFor(column, false),
						'content-type': 'application/json'
					},
					body: '{}',
					redirect: 'manual'
				});
				checked++;
				if (res.status !== 405) problems.push(`${unused} ${url} as ${column}: ${res.status}`);
				else if (!res.headers.get('allow'))
					problems.push(`${unused} ${url}: 405 without an Allow header`);
			}
		}
		expect(checked).toBeGreaterThan(50);
		expect(problems).toEqual([]);
	});

	it('answers a POST to a page without form actions with 405 for roles that may read the page', async () => {
		const problems: string[] = [];
		let checked = 0;
		for (const route of routes.filter((r) => r.page && r.actions.length === 0 && EXPECTED[r.id])) {
			const statuses = asProbe(EXPECTED[route.id].probes.GET)
				.expect.trim()
				.split(/\s+/)
				.map(Number);
			const url = fillRoute(route, ids);
			for (const [i, column] of COLUMNS.entries()) {
				if (statuses[i] !== 200 || column === 'out') continue;
				const res = await send(route, 'POST', url, await cookieFor(column, false));
				checked++;
				if (res.status !== 405) problems.push(`POST ${url} as ${column}: ${res.status}`);
			}
		}
		expect(checked).toBeGreaterThan(15);
		expect(problems).toEqual([]);
	});
});

// ---------------------------------------------------------------------------------------------
// Sign-in throttling, sessions, headers
// ---------------------------------------------------------------------------------------------

async function failures(key: string): Promise<number> {
	const [row] = await sequelize.query<{ n: string }>(
		`SELECT count(*) AS n FROM sign_in_failures WHERE key = :key`,
		{
			replacements: { key },
			type: QueryTypes.SELECT
		}
	);
	return Number(row.n);
}

describe('sign-in throttling (counted in PostgreSQL)', () => {
	it(`refuses the ${SIGN_IN_LIMITS.perEmail + 1}th attempt for one e-mail with 429 and a clear message, even with the right password`, async () => {
		// src/lib/server/auth/throttle.ts: 8 failures per e-mail in 15 minutes
		expect(SIGN_IN_LIMITS).toMatchObject({ perEmail: 8, windowMinutes: 15 });
		const email = uniqueEmail('throttled');
		await createUser({
			name: 'Throttled Rep',
			email,
			role: 'rep',
			teamId: null,
			password: 'the-right-password-1'
		});
		for (let i = 1; i <= 8; i++) {
			const res = await client().action('/login', { email, password: `wrong-${i}` });
			expect(res.status, `attempt ${i}`).toBe(400);
			expect(await failures(`email:${email}`), 'one row per failure in sign_in_failures').toBe(i);
		}
		const ninth = await client().action('/login', { email, password: 'the-right-password-1' });
		expect(ninth.status).toBe(429);
		expect(
			ninth.headers
				.getSetCookie()
				.some((c) => c.startsWith('traywise_session=') && !/Max-Age=0/i.test(c))
		).toBe(false);
		expect(await ninth.text()).toMatch(
			/Too many sign-in attempts\. Wait 15 minutes and try again\./
		);
		// the refused attempt is not counted again, and the same e-mail in another case is the same key
		expect(await failures(`email:${email}`)).toBe(8);
		expect(
			(
				await client().action('/login', {
					email: email.toUpperCase(),
					password: 'the-right-password-1'
				})
			).status
		).toBe(429);

		// the rows are the whole state: once they age out of the window, the right password works again
		await sequelize.query(
			`UPDATE sign_in_failures SET at = now() - interval '16 minutes' WHERE key = :key`,
			{
				replacements: { key: `email:${email}` }
			}
		);
		expect(await signInCookie(email, 'the-right-password-1')).not.toBeNull();
		// a success clears the e-mail's count
		expect(await failures(`email:${email}`)).toBe(0);
	});

	it('counts wrong current passwords on /account against the same limit, so a borrowed session cannot guess', async () => {
		const email = uniqueEmail('guesser');
		await createUser({
			name: 'Borrowed Session',
			email,
			role: 'rep',
			teamId: null,
			password: 'the-real-password-1'
		});
		const c = await signIn(email, 'the-real-password-1');
		const change = (current: string) =>
			c.action('/account?/password', {
				current,
				next: 'a-new-password-12',
				repeat: 'a-new-password-12'
			});
		for (let i = 1; i <= 8; i++)
			expect((await change(`guess-${i}`)).status, `guess ${i}`).toBe(400);
		expect(await failures(`email:${email}`)).toBe(8);
		const ninth = await change('the-real-password-1');
		expect(ninth.status).toBe(429);
		expect(await ninth.text()).toContain(
			'Too many wrong passwords. Wait 15 minutes and try again.'
		);
		expect(await signInCookie(email, 'the-real-password-1')).toBeNull();
		await sequelize.query(`DELETE FROM sign_in_failures WHERE key = :key`, {
			replacements: { key: `email:${email}` }
		});
		expect((await change('the-real-password-1')).status).toBe(200);
	});

	it(`refuses every e-mail from one address after ${SIGN_IN_LIMITS.perAddress} failures from it`, async () => {
		const email = uniqueEmail('address');
		expect((await client().action('/login', { email, password: 'wrong' })).status).toBe(400);
		const [row] = await sequelize.query<{ key: string }>(
			`SELECT key FROM sign_in_failures WHERE key LIKE 'ip:%' ORDER BY at DESC LIMIT 1`,
			{ type: QueryTypes.SELECT }
		);
		expect(row.key).toMatch(/^ip:.*127\.0\.0\.1$/);
		const marker = `${Date.now()}`;
		try {
			// top the address up to the limit with rows dated now (as other failures would be)
			const have = await failures(row.key);
			await sequelize.query(
				`INSERT INTO sign_in_failures (key) SELECT :key FROM generate_series(1, :n)`,
				{
					replacements: { key: row.key, n: Math.max(0, SIGN_IN_LIMITS.perAddress - have) }
				}
			);
			const res = await client().action('/login', {
				email: uniqueEmail(`other-${marker}`),
				password: 'anything-at-all'
			});
			expect(res.status).toBe(429);
			expect(await res.text()).toContain('Too many sign-in attempts');
			expect(await signInCookie(DEMO.rep)).toBeNull();
		} finally {
			// the whole suite signs in from this address: give it back
			await sequelize.query(`DELETE FROM sign_in_failures WHERE key = :key`, {
				replacements: { key: row.key }
			});
		}
		expect(await signInCookie(DEMO.rep)).not.toBeNull();
	});
});

describe('sessions end when they should', () => {
	it('a password change on /account signs out every other session of the user, and keeps this one', async () => {
		const email = uniqueEmail('changer');
		const id = await createUser({
			name: 'Password Changer',
			email,
			role: 'rep',
			teamId: null,
			password: 'first-password-123'
		});
		const here = await signIn(email, 'first-password-123');
		const tablet = await signIn(email, 'first-password-123');
		const phone = await signIn(email, 'first-password-123');
		expect(await Session.count({ where: { userId: id } })).toBe(3);

		const wrong = await here.action('/account?/password', {
			current: 'not-it',
			next: 'second-password-456',
			repeat: 'second-password-456'
		});
		expect(wrong.status).toBe(400);
		expect(await Session.count({ where: { userId: id } })).toBe(3);

		const res = await here.action('/account?/password', {
			current: 'first-password-123',
			next: 'second-password-456',
			repeat: 'second-password-456'
		});
		expect(res.status).toBe(200);
		expect(await res.text()).toContain('Password changed. Other devices are signed out.');
		expect(await Session.count({ where: { userId: id } })).toBe(1);
		expect((await here.get('/account')).status).toBe(200);
		for (const other of [tablet, phone]) {
			const page = await other.get('/account');
			expect(page.status).toBe(303);
			expect(page.headers.get('location')).toBe('/login?next=%2Faccount');
			const api = await other.get('/api/v1/customers', { headers: { accept: 'application/json' } });
			expect(api.status).toBe(401);
		}
		expect(await signInCookie(email, 'first-password-123')).toBeNull();
		expect(await signInCookie(email, 'second-password-456')).not.toBeNull();
	});

	it('deactivation through the users page ends every session at once; pages redirect and APIs answer JSON 401', async () => {
		const email = uniqueEmail('deactivated');
		const id = await createUser({
			name: 'Soon Gone',
			email,
			role: 'manager',
			teamId: null,
			password: 'leaving-password-1'
		});
		const a = await signIn(email, 'leaving-password-1');
		const b = await signIn(email, 'leaving-password-1');
		expect((await a.get('/pipeline')).status).toBe(200);
		const res = await sessions.admin.action('/admin/users?/update', {
			id,
			role: 'manager',
			teamId: ''
		});
		expect(res.status).toBe(200);
		expect(await Session.count({ where: { userId: id } })).toBe(0);
		for (const c of [a, b]) {
			expect((await c.get('/pipeline')).status).toBe(303);
			const api = await c.get('/api/v1/evaluate', {
				method: 'POST',
				headers: { 'content-type': 'application/json' },
				body: '{}'
			});
			expect(api.status).toBe(401);
			expect(api.headers.get('content-type')).toContain('application/json');
		}
		expect(await signInCookie(email, 'leaving-password-1')).toBeNull();
	});

	it('a role change takes effect on the next request of an open session', async () => {
		const email = uniqueEmail('demoted');
		const id = await createUser({
			name: 'Soon Rep',
			email,
			role: 'manager',
			teamId: null,
			password: 'demoted-password-1'
		});
		const c = await signIn(email, 'demoted-password-1');
		expect((await c.get('/approvals')).status).toBe(200);
		expect(
			(
				await sessions.admin.action('/admin/users?/update', {
					id,
					role: 'rep',
					teamId: '',
					active: 'on'
				})
			).status
		).toBe(200);
		expect((await c.get('/approvals')).status).toBe(403);
	});

	it('a session cookie that is not in the database is ignored and cleared', async () => {
		const c = client(`traywise_session=${randomUUID().replace(/-/g, '')}`);
		const res = await c.get('/surveys');
		expect(res.status).toBe(303);
		expect(
			res.headers
				.getSetCookie()
				.some((s) => s.startsWith('traywise_session=;') || /Max-Age=0/i.test(s))
		).toBe(true);
	});
});

describe('security headers', () => {
	const COMMON = (res: Response, where: string) => {
		expect(res.headers.get('x-content-type-options'), where).toBe('nosniff');
		expect(res.headers.get('referrer-policy'), where).toBe('strict-origin-when-cross-origin');
		expect(res.headers.get('x-frame-options'), where).toBe('DENY');
		expect(res.headers.get('x-powered-by'), where).toBeNull();
		expect(res.headers.get('server'), where).toBeNull();
	};

	function directives(csp: string): Map<string, string[]> {
		return new Map(
			csp
				.split(';')
				.map((d) => d.trim().split(/\s+/))
				.filter((d) => d[0])
				.map(([name, ...values]) => [name, values])
		);
	}

	it('pages carry kit.csp with a fresh nonce on every inline script, frame-ancestors none and no unsafe script sources', async () => {
		const pages: [string, Client][] = [
			['/login', client()],
			['/surveys', sessions.rep],
			[`/quotes/${ids['quotes/id']}`, sessions.manager],
			['/admin/settings', sessions.admin],
			['/no-such-page', sessions.rep]
		];
		const nonces = new Set<string>();
		for (const [path, c] of pages) {
			const res = await c.get(path, { headers: { accept: 'text/html' } });
			expect([200, 404], path).toContain(res.status);
			COMMON(res, path);
			const csp = res.headers.get('content-security-policy');
			expect(csp, path).toBeTruthy();
			const d = directives(csp!);
			expect(d.get('frame-ancestors'), path).toEqual(["'none'"]);
			expect(d.get('object-src'), path).toEqual(["'none'"]);
			expect(d.get('base-uri'), path).toEqual(["'self'"]);
			expect(d.get('default-src'), path).toEqual(["'self'"]);
			const script = d.get('script-src')!;
			expect(script, path).not.toContain("'unsafe-inline'");
			expect(script, path).not.toContain("'unsafe-eval'");
			const nonce = script.find((s) => s.startsWith("'nonce-"))?.slice(7, -1);
			expect(nonce, `${path}: a nonce in script-src`).toMatch(/^[A-Za-z0-9+/=]{16,}$/);
			nonces.add(nonce!);
			const html = await res.text();
			const inline = [...html.matchAll(/<script(?![^>]*\bsrc=)([^>]*)>/g)];
			expect(inline.length, `${path}: SvelteKit's start script is inline`).toBeGreaterThan(0);
			for (const [, attrs] of inline) expect(attrs, path).toContain(`nonce="${nonce}"`);
		}
		expect(nonces.size, 'a new nonce per response').toBe(pages.length);
	});

	it('JSON, errors, redirects and files carry the same headers; JSON answers forbid framing and loading anything', async () => {
		const checks: [string, Client, RequestInit?][] = [
			['/api/health', client()],
			['/api/v1/customers', sessions.rep],
			['/api/v1/customers', client()],
			['/api/v1/admin/users', sessions.rep],
			[
				'/api/v1/evaluate',
				sessions.rep,
				{ method: 'POST', body: '{', headers: { 'content-type': 'application/json' } }
			],
			['/surveys', client()],
			[`/quotes/${ids['quotes/id']}/pdf`, sessions.rep],
			[`/uploads/${ids['uploads/id']}`, sessions.rep]
		];
		for (const [path, c, init] of checks) {
			const res = await c.get(path, {
				...init,
				headers: { accept: 'text/html', ...(init?.headers ?? {}) }
			});
			const where = `${init?.method ?? 'GET'} ${path} → ${res.status}`;
			COMMON(res, where);
			if (res.headers.get('content-type')?.includes('application/json')) {
				const d = directives(res.headers.get('content-security-policy') ?? '');
				expect(d.get('default-src'), where).toEqual(["'none'"]);
				expect(d.get('frame-ancestors'), where).toEqual(["'none'"]);
			}
		}
	});

	it('refuses a form action posted from another origin (cross-site request forgery)', async () => {
		const units = async () =>
			(
				await sequelize.query<{ unit_system: string }>(
					`SELECT unit_system FROM users WHERE email = :e`,
					{
						replacements: { e: DEMO.rep },
						type: QueryTypes.SELECT
					}
				)
			)[0].unit_system;
		const before = await units();
		const res = await fetch(`${BASE}/account?/units`, {
			method: 'POST',
			headers: {
				cookie: sessions.rep.cookie,
				origin: 'http://attacker.invalid',
				'content-type': 'application/x-www-form-urlencoded',
				accept: 'text/html'
			},
			body: `unitSystem=${before === 'metric' ? 'imperial' : 'metric'}`,
			redirect: 'manual'
		});
		expect(res.status).toBe(403);
		expect(await units()).toBe(before);
	});

	it('sets the session cookie HttpOnly, SameSite=Lax, for the whole site, with a 12-hour life', async () => {
		const res = await client().action('/login', { email: DEMO.manager, password: DEMO_PASSWORD });
		const cookie = res.headers.getSetCookie().find((c) => c.startsWith('traywise_session='))!;
		expect(cookie).toMatch(/HttpOnly/i);
		expect(cookie).toMatch(/SameSite=Lax/i);
		expect(cookie).toMatch(/Path=\//i);
		// lucia's sessionExpiresIn: 12 h = 43 200 s (src/lib/server/auth/lucia.ts)
		expect(cookie).toMatch(/Max-Age=43200(;|$)/i);
	});
});
