/**
 * The benchmark report (issue 7): every figure beside its floor measured in the same run, with the
 * aim and whether it was met, printed as a table and written to bench/results.json.
 *
 *   npm run bench   (bench/run.sh: its own database, services and `node build` on 127.0.0.1)
 *
 * Expects APP_URL (a server started with TRAYWISE_COUNT_QUERIES=1) and DATABASE_URL of the same
 * database. Every HTTP measurement is bounded (BENCH_SECONDS, 10 s by default, after a 2 s warm-up)
 * and only ever aimed at 127.0.0.1. The customer page is measured when this build has the route and
 * a link can be had: BENCH_QUOTE_TOKEN, else the link mailed when the bench sends the demo quote.
 */
import { execFileSync } from 'node:child_process';
import { writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { gzipSync } from 'node:zlib';
import autocannon from 'autocannon';
import { runEngineBench, type EngineBenchFigures } from './engine';
import { runPdfBench, type PdfBenchFigures } from './pdf';
import { BASE, DEMO, client, signIn, type Client } from '../tests/helpers/http';
import {
	currentLines,
	demoChosenSurvey,
	demoQuote,
	priceBookLines,
	saveDraft,
	sendQuote
} from '../tests/helpers/flows';
import { customerPageExists, mailedQuoteToken } from '../tests/helpers/customer-link';
import { DESIGN_EXAMPLE_REQUEST } from '../src/lib/server/rules';
import { sequelize } from '../src/lib/server/db';
import { getQuote } from '../src/lib/server/repositories/quotes';
import { pdfSettings } from '../src/lib/server/quotes/workflow';

const here = path.dirname(fileURLToPath(import.meta.url));
/** seconds per HTTP measurement, 1–30 (BENCH_SECONDS) */
const SECONDS = Math.min(30, Math.max(1, Number(process.env.BENCH_SECONDS) || 10));
const WARMUP_SECONDS = 2;
const CONNECTIONS = 32;

/** Aims from issue 7. */
const AIM = {
	engineEvaluationsPerSecond: 20_000,
	engineRatio: 10,
	routeShareOfBare: 0.6,
	p99Ms: 30,
	pdfRatio: 4,
	wizardJsGzipBytes: 100 * 1024,
	/** "the same small number": equal for 5 and 50 lines, and no more than this */
	sqlPerPage: 20
} as const;

// ---------------------------------------------------------------- HTTP under load

interface HttpFigures {
	route: string;
	/** SQL statements of one request (x-sql-queries) */
	sqlQueries: number;
	/** body bytes of one answer */
	responseBytes: number;
	connections: number;
	seconds: number;
	requestsPerSecond: number;
	requests: number;
	latencyP50Ms: number;
	latencyP99Ms: number;
	errors: number;
	timeouts: number;
	non2xx: number;
	statusCodes: Record<string, number>;
}

interface Target {
	route: string;
	path: string;
	method?: 'GET' | 'POST';
	headers?: Record<string, string>;
	body?: string;
}

async function cannon(t: Target, seconds: number): Promise<autocannon.Result> {
	return autocannon({
		url: BASE + t.path,
		method: t.method ?? 'GET',
		headers: { origin: BASE, ...t.headers },
		body: t.body,
		connections: CONNECTIONS,
		duration: seconds,
		timeout: 10
	});
}

/** One request outside the load: its status, SQL statements (x-sql-queries) and body size. */
async function probe(t: Target): Promise<{ status: number; sql: number; bytes: number }> {
	const res = await get(() =>
		fetch(BASE + t.path, {
			method: t.method ?? 'GET',
			headers: { origin: BASE, ...t.headers },
			body: t.body,
			redirect: 'manual'
		})
	);
	const bytes = (await res.arrayBuffer()).byteLength;
	return { status: res.status, sql: Number(res.headers.get('x-sql-queries') ?? NaN), bytes };
}

/**
 * One request first (it must answer 200), a warm-up run (not counted), one request after it for the
 * steady SQL count (caches filled), then the measured run.
 */
async function measure(t: Target): Promise<HttpFigures> {
	const first = await probe(t);
	if (first.status !== 200) throw new Error(`${t.route} answered ${first.status} before the load`);
	await cannon(t, WARMUP_SECONDS);
	const steady = await probe(t);
	const r = await cannon(t, SECONDS);
	return {
		route: t.route,
		sqlQueries: steady.sql,
		responseBytes: steady.bytes,
		connections: CONNECTIONS,
		seconds: r.duration,
		requestsPerSecond: r.requests.average,
		requests: r.requests.total,
		latencyP50Ms: r.latency.p50,
		latencyP99Ms: r.latency.p99,
		errors: r.errors,
		timeouts: r.timeouts,
		non2xx: r.non2xx,
		statusCodes: Object.fromEntries(
			Object.entries(r.statusCodeStats).map(([code, s]) => [code, Number(s.count)])
		)
	};
}

/**
 * A GET, tried once more when the connection drops: after a long CPU-bound step (the engine or PDF
 * rounds) a kept-alive socket the server has since closed can be reused once.
 */
async function get(fn: () => Promise<Response>): Promise<Response> {
	try {
		return await fn();
	} catch (err) {
		if ((err as { cause?: { code?: string } }).cause?.code !== 'UND_ERR_SOCKET') throw err;
		return fn();
	}
}

// ---------------------------------------------------------------- first JavaScript of a page

interface JsFigures {
	page: string;
	files: { url: string; bytes: number; gzipBytes: number }[];
	bytes: number;
	gzipBytes: number;
}

/**
 * The JavaScript a page makes the browser load before it is interactive: its modulepreloads (Link
 * header and link tags), script tags and the entry `import("…")` calls in its HTML, each fetched once
 * and gzipped with zlib.
 */
async function firstJs(c: Client, pagePath: string): Promise<JsFigures> {
	const res = await get(() => c.get(pagePath));
	if (res.status !== 200) throw new Error(`${pagePath} answered ${res.status}`);
	const html = await res.text();
	const pageUrl = new URL(pagePath, BASE);
	const refs = new Set<string>();
	// SvelteKit sends a server-rendered page's modulepreloads as a Link header (tags when prerendered)
	for (const m of (res.headers.get('link') ?? '').matchAll(/<([^>]+)>([^,]*)/g)) {
		if (/\brel="?modulepreload"?/.test(m[2])) refs.add(new URL(m[1], pageUrl).href);
	}
	for (const tag of html.match(/<link\b[^>]*>/g) ?? []) {
		if (!/\brel="modulepreload"/.test(tag)) continue;
		const href = /\bhref="([^"]+)"/.exec(tag)?.[1];
		if (href) refs.add(new URL(href, pageUrl).href);
	}
	for (const m of html.matchAll(/<script\b[^>]*\bsrc="([^"]+)"/g))
		refs.add(new URL(m[1], pageUrl).href);
	for (const m of html.matchAll(/import\(\s*["']([^"']+)["']\s*\)/g))
		refs.add(new URL(m[1], pageUrl).href);
	const files: JsFigures['files'] = [];
	for (const url of [...refs].sort()) {
		if (new URL(url).origin !== pageUrl.origin) continue;
		const got = await get(() => fetch(url));
		if (!got.ok) throw new Error(`${url} answered ${got.status}`);
		const body = Buffer.from(await got.arrayBuffer());
		files.push({
			url: url.slice(pageUrl.origin.length),
			bytes: body.length,
			gzipBytes: gzipSync(body).length
		});
	}
	if (files.length === 0) throw new Error(`no JavaScript found in the HTML of ${pagePath}`);
	return {
		page: pagePath,
		files,
		bytes: files.reduce((s, f) => s + f.bytes, 0),
		gzipBytes: files.reduce((s, f) => s + f.gzipBytes, 0)
	};
}

// ---------------------------------------------------------------- SQL statements per page

/** The `x-sql-queries` header of the second visit (the first may do one-off work). */
async function sqlCount(c: Client, pagePath: string): Promise<{ first: number; steady: number }> {
	const counts: number[] = [];
	for (let i = 0; i < 2; i++) {
		const res = await get(() => c.get(pagePath));
		await res.arrayBuffer();
		if (res.status !== 200) throw new Error(`${pagePath} answered ${res.status}`);
		const header = res.headers.get('x-sql-queries');
		if (header == null)
			throw new Error('no x-sql-queries header: start the app with TRAYWISE_COUNT_QUERIES=1');
		counts.push(Number(header));
	}
	return { first: counts[0], steady: counts[1] };
}

// ---------------------------------------------------------------- the run

interface Row {
	what: string;
	figure: string;
	floor: string;
	aim: string;
	met: boolean | null;
}

const num = (n: number) => Math.round(n).toLocaleString('en-US');
const kb = (bytes: number) => `${(bytes / 1024).toFixed(1)} KB`;
const pct = (a: number, b: number) => `${Math.round((100 * a) / b)} %`;

function httpRow(what: string, fig: HttpFigures | null, bare: HttpFigures, why: string): Row {
	const aim = `≥ ${AIM.routeShareOfBare * 100} % of floor req/s, p99 ≤ ${AIM.p99Ms} ms, no errors`;
	const floor = `GET /api/health ${num(bare.requestsPerSecond)} req/s, p99 ${bare.latencyP99Ms} ms`;
	if (!fig) return { what, figure: `not measured (${why})`, floor, aim, met: null };
	const clean = fig.errors === 0 && fig.non2xx === 0;
	const faults = clean ? '' : `; ${fig.errors} errors, ${fig.non2xx} non-2xx`;
	return {
		what,
		figure: `${num(fig.requestsPerSecond)} req/s (${pct(fig.requestsPerSecond, bare.requestsPerSecond)}), p99 ${fig.latencyP99Ms} ms${faults}`,
		floor,
		aim,
		met:
			clean &&
			fig.requestsPerSecond >= AIM.routeShareOfBare * bare.requestsPerSecond &&
			fig.latencyP99Ms <= AIM.p99Ms
	};
}

function printTable(rows: Row[]): void {
	const head: Row = {
		what: 'measure',
		figure: 'figure',
		floor: 'floor (same run)',
		aim: 'aim',
		met: null
	};
	const cells = (r: Row, isHead = false) => [
		r.what,
		r.figure,
		r.floor,
		r.aim,
		isHead ? 'met' : r.met == null ? '—' : r.met ? 'yes' : 'NO'
	];
	const all = [cells(head, true), ...rows.map((r) => cells(r))];
	const widths = all[0].map((_, i) => Math.max(...all.map((c) => c[i].length)));
	const line = (c: string[]) => '| ' + c.map((x, i) => x.padEnd(widths[i])).join(' | ') + ' |';
	console.log(line(all[0]));
	console.log('|' + widths.map((w) => '-'.repeat(w + 2)).join('|') + '|');
	for (const c of all.slice(1)) console.log(line(c));
}

function gitCommit(): string | null {
	try {
		return execFileSync('git', ['rev-parse', '--short', 'HEAD'], {
			cwd: here,
			encoding: 'utf8'
		}).trim();
	} catch {
		return null;
	}
}

async function main(): Promise<void> {
	if (new URL(BASE).hostname !== '127.0.0.1')
		throw new Error(`refusing to load ${BASE}: the benchmark only targets 127.0.0.1`);
	const started = new Date();
	const loadBefore = os.loadavg()[0];
	const health = await fetch(`${BASE}/api/health`);
	if (health.status !== 200) throw new Error(`${BASE}/api/health answered ${health.status}`);

	console.log('engine …');
	const engine: EngineBenchFigures = runEngineBench();

	console.log('demo survey and quote …');
	const rep = await signIn(DEMO.rep);
	const surveyId = await demoChosenSurvey(rep);
	const quoteId = await demoQuote(rep, surveyId);

	console.log('first JavaScript …');
	const wizardPath = `/surveys/${surveyId}/fleet`;
	const wizardJs = await firstJs(rep, wizardPath);
	const signInJs = await firstJs(client(), '/login');

	console.log('SQL per quote page …');
	const hasCustomerPage = customerPageExists();
	const sql: Record<
		string,
		{
			quoteId: string;
			staffPage: { first: number; steady: number };
			customerPage: { first: number; steady: number } | null;
		}
	> = {};
	for (const n of [5, 50]) {
		const id = await demoQuote(rep, surveyId);
		const contact = `bench-${n}-lines-${Date.now()}@bench.traywise.test`;
		await saveDraft(rep, id, await priceBookLines(n), contact);
		const staffPage = await sqlCount(rep, `/quotes/${id}`);
		let customerPage = null;
		if (hasCustomerPage) {
			const since = new Date();
			await sendQuote(rep, id);
			const token = await mailedQuoteToken(id, { to: contact, since });
			if (token) customerPage = await sqlCount(client(), `/q/${encodeURIComponent(token)}`);
		}
		sql[`${n}`] = { quoteId: id, staffPage, customerPage };
	}

	// the customer page: a given token, else a fresh link to the demo quote once sent
	let customerToken = process.env.BENCH_QUOTE_TOKEN || null;
	let customerWhy = 'no customer page route q/[token] in this build';
	if (!customerToken && hasCustomerPage) {
		const contact = `bench-demo-${Date.now()}@bench.traywise.test`;
		const since = new Date();
		await saveDraft(rep, quoteId, await currentLines(quoteId), contact);
		await sendQuote(rep, quoteId);
		customerToken = await mailedQuoteToken(quoteId, { to: contact, since });
		if (!customerToken)
			customerWhy = 'sending the demo quote queued no mail with a /q/<token> link';
	}

	// CPU-bound in this process: after the set-up requests, so no kept-alive socket idles through it
	console.log('quote PDF …');
	const view = await getQuote(quoteId, null);
	if (!view.ok) throw new Error('the demo quote vanished');
	const pdf: PdfBenchFigures = await runPdfBench(view.value, await pdfSettings());

	console.log(
		`HTTP at ${CONNECTIONS} connections, ${SECONDS} s each after a ${WARMUP_SECONDS} s warm-up …`
	);
	const bare = await measure({ route: 'GET /api/health', path: '/api/health' });
	const evaluate = await measure({
		route: 'POST /api/v1/evaluate',
		path: '/api/v1/evaluate',
		method: 'POST',
		headers: { cookie: rep.cookie, 'content-type': 'application/json', accept: 'application/json' },
		body: JSON.stringify(DESIGN_EXAMPLE_REQUEST)
	});
	const surveyPage = await measure({
		route: 'GET /surveys/<id>/fleet',
		path: wizardPath,
		headers: { cookie: rep.cookie, accept: 'text/html' }
	});
	let customerPage: HttpFigures | null = null;
	if (customerToken) {
		try {
			customerPage = await measure({
				route: 'GET /q/<token>',
				path: `/q/${encodeURIComponent(customerToken)}`,
				headers: { accept: 'text/html' }
			});
		} catch (err) {
			customerWhy = (err as Error).message;
		}
	}

	const rows: Row[] = [
		{
			what: 'engine evaluate() (DESIGN.md §4 example)',
			figure: `${num(engine.evaluationsPerSecond)} /s (${engine.meanMicroseconds.toFixed(1)} µs each)`,
			floor: `JSON.parse(JSON.stringify(payload)) ${num(engine.floorOpsPerSecond)} /s → ${engine.ratio.toFixed(1)}×`,
			aim: `≥ ${num(AIM.engineEvaluationsPerSecond)} /s, ≤ ${AIM.engineRatio}× floor`,
			met:
				engine.evaluationsPerSecond >= AIM.engineEvaluationsPerSecond &&
				engine.ratio <= AIM.engineRatio
		},
		httpRow(`POST /api/v1/evaluate, ${CONNECTIONS} conn.`, evaluate, bare, ''),
		httpRow(`survey page /surveys/<id>/fleet, ${CONNECTIONS} conn.`, surveyPage, bare, ''),
		httpRow(`customer page /q/<token>, ${CONNECTIONS} conn.`, customerPage, bare, customerWhy),
		{
			what: `quote PDF build (demo quote, ${pdf.quotePages} pages)`,
			figure: `${pdf.quoteMs.toFixed(1)} ms`,
			floor: `one page, same fonts ${pdf.floorMs.toFixed(1)} ms → ${pdf.ratio.toFixed(2)}×`,
			aim: `≤ ${AIM.pdfRatio}× floor`,
			met: pdf.ratio <= AIM.pdfRatio
		},
		{
			what: 'survey wizard first JS, gzipped',
			figure: `${kb(wizardJs.gzipBytes)} (${wizardJs.files.length} files, ${kb(wizardJs.bytes)} raw)`,
			floor: `sign-in page ${kb(signInJs.gzipBytes)} (${signInJs.files.length} files)`,
			aim: `≤ ${AIM.wizardJsGzipBytes / 1024} KB`,
			met: wizardJs.gzipBytes <= AIM.wizardJsGzipBytes
		},
		{
			what: 'SQL statements, staff quote page',
			figure: `50 lines: ${sql['50'].staffPage.steady}`,
			floor: `5 lines: ${sql['5'].staffPage.steady}`,
			aim: `equal, ≤ ${AIM.sqlPerPage}`,
			met:
				sql['50'].staffPage.steady === sql['5'].staffPage.steady &&
				sql['50'].staffPage.steady <= AIM.sqlPerPage
		}
	];
	const c5 = sql['5'].customerPage;
	const c50 = sql['50'].customerPage;
	rows.push(
		c5 && c50
			? {
					what: 'SQL statements, customer page',
					figure: `50 lines: ${c50.steady}`,
					floor: `5 lines: ${c5.steady}`,
					aim: `equal, ≤ ${AIM.sqlPerPage}`,
					met: c50.steady === c5.steady && c50.steady <= AIM.sqlPerPage
				}
			: {
					what: 'SQL statements, customer page',
					figure: `not measured (${customerWhy})`,
					floor: '',
					aim: `equal, ≤ ${AIM.sqlPerPage}`,
					met: null
				}
	);

	const report = {
		generatedAt: started.toISOString(),
		seconds: (Date.now() - started.getTime()) / 1000,
		/** 1-minute load average at the start and the end: other work on the machine skews every figure */
		loadAverage: { start: loadBefore, end: os.loadavg()[0] },
		machine: {
			node: process.version,
			platform: `${os.platform()} ${os.release()}`,
			cpus: os.cpus().length,
			cpuModel: os.cpus()[0]?.model ?? null
		},
		commit: gitCommit(),
		appUrl: BASE,
		aims: AIM,
		rows,
		engine,
		http: {
			connections: CONNECTIONS,
			seconds: SECONDS,
			warmupSeconds: WARMUP_SECONDS,
			bare,
			evaluate,
			surveyPage,
			customerPage,
			customerPageNote: customerPage ? null : customerWhy
		},
		pdf,
		javascript: { wizard: wizardJs, signIn: signInJs },
		sql: {
			staffPage: { '5': sql['5'].staffPage, '50': sql['50'].staffPage },
			customerPage: { '5': c5, '50': c50 }
		}
	};
	writeFileSync(path.join(here, 'results.json'), JSON.stringify(report, null, '\t') + '\n');

	console.log(
		`\nTraywise benchmark, ${started.toISOString().slice(0, 16).replace('T', ' ')} UTC, commit ${report.commit ?? '?'}, Node ${process.version}, ${os.cpus().length} CPUs`
	);
	console.log(
		`(app, database and load generator share this machine, 1-min load average ${report.loadAverage.start.toFixed(1)} → ${report.loadAverage.end.toFixed(1)}; HTTP: ${CONNECTIONS} connections for ${SECONDS} s after ${WARMUP_SECONDS} s warm-up)\n`
	);
	printTable(rows);
	const missed = rows.filter((r) => r.met === false).length;
	const open = rows.filter((r) => r.met === null).length;
	console.log(
		`\n${rows.length - missed - open} met, ${missed} missed, ${open} not measured · written to bench/results.json`
	);
}

// a run never outlives ten minutes, whatever hangs
setTimeout(() => {
	console.error('[bench] still running after 10 minutes: stopping');
	process.exit(2);
}, 10 * 60_000).unref();

try {
	await main();
} finally {
	await sequelize.close();
}
