/**
 * Quote PDF benchmark (issue 5): the time to build the demo quote's PDF with `buildQuotePdf`, against
 * the floor measured in the same run: a one-page pdfkit document with the same page size, margins and
 * embedded fonts (the app's Inter faces) and a few lines of text. Aim: within 4× the floor.
 *
 *   npm run bench:pdf   (bench/run.sh pdf: a fresh traywise_bench database, migrated and seeded)
 *
 * `runPdfBench(view, settings)` returns the figures for the combined report (bench/run.ts);
 * `demoQuoteView()` builds the demo quote through the domain functions, without the web server.
 */
import { randomUUID } from 'node:crypto';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import PDFDocument from 'pdfkit';
import { registerFonts } from '../src/lib/server/pdf/fonts';
import { buildQuotePdf, type PdfSettings } from '../src/lib/server/pdf/quote-pdf';
import type { QuoteView } from '../src/lib/server/repositories/quotes';

export interface PdfBenchFigures {
	/** median time to build the quote's PDF, ms */
	quoteMs: number;
	/** median time to build the one-page floor document, ms */
	floorMs: number;
	/** quote ÷ floor */
	ratio: number;
	quotePages: number;
	quoteBytes: number;
	floorBytes: number;
	quoteLines: number;
	rounds: number;
	targetRatio: number;
	meetsTarget: boolean;
}

/** The floor: what any one-page document with our fonts costs (font subsetting and embedding included). */
export function buildOnePagePdf(settings: Pick<PdfSettings, 'dealerName'>): Promise<Buffer> {
	const doc = new PDFDocument({
		size: 'LETTER',
		margins: { top: 56, bottom: 64, left: 48, right: 48 },
		bufferPages: true
	});
	registerFonts(doc);
	const chunks: Buffer[] = [];
	doc.on('data', (c: Buffer) => chunks.push(c));
	const done = new Promise<Buffer>((resolve, reject) => {
		doc.on('end', () => resolve(Buffer.concat(chunks)));
		doc.on('error', reject);
	});
	doc.font('Bold').fontSize(14).text(settings.dealerName);
	doc.font('Semi').fontSize(11).text('Quote');
	doc
		.font('Body')
		.fontSize(9.5)
		.text('One page with the three embedded faces: the least any quote document costs.');
	doc.end();
	return done;
}

function median(xs: number[]): number {
	const s = [...xs].sort((a, b) => a - b);
	const m = s.length >> 1;
	return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
}

/** Pages in a pdfkit document: its page objects (`/Type /Page`, not `/Pages`). */
export function countPages(pdf: Buffer): number {
	return (pdf.toString('latin1').match(/\/Type \/Page\b(?!s)/g) ?? []).length;
}

/**
 * Builds the quote's PDF and the one-page floor `rounds` times each, interleaved (after `warmup`
 * builds of each), and compares the medians.
 */
export async function runPdfBench(
	view: QuoteView,
	settings: PdfSettings,
	opts: { rounds?: number; warmup?: number } = {}
): Promise<PdfBenchFigures> {
	const rounds = opts.rounds ?? 15;
	const warmup = opts.warmup ?? 3;
	let quote: Buffer = Buffer.alloc(0);
	let floor: Buffer = Buffer.alloc(0);
	for (let i = 0; i < warmup; i++) {
		quote = await buildQuotePdf(view, settings);
		floor = await buildOnePagePdf(settings);
	}
	const q: number[] = [];
	const f: number[] = [];
	for (let i = 0; i < rounds; i++) {
		let t = performance.now();
		quote = await buildQuotePdf(view, settings);
		q.push(performance.now() - t);
		t = performance.now();
		floor = await buildOnePagePdf(settings);
		f.push(performance.now() - t);
	}
	const quoteMs = median(q);
	const floorMs = median(f);
	const ratio = quoteMs / floorMs;
	return {
		quoteMs,
		floorMs,
		ratio,
		quotePages: countPages(quote),
		quoteBytes: quote.length,
		floorBytes: floor.length,
		quoteLines: view.lines.length,
		rounds,
		targetRatio: 4,
		meetsTarget: ratio <= 4
	};
}

/**
 * The demo quote (shared/DESIGN.md scenario: six trucks, three shifts, hoist exchange chosen) built
 * by the same domain functions the pages call, as the demo sales rep.
 */
export async function demoQuoteView(): Promise<QuoteView> {
	const { authenticate } = await import('../src/lib/server/repositories/users');
	const { chooseSetup, createSurvey, saveStep } =
		await import('../src/lib/server/repositories/surveys');
	const { draftStepSchema } = await import('../src/lib/schemas/survey');
	const { buildEvaluateBody } = await import('../src/lib/survey-input');
	const { runEvaluation } = await import('../src/lib/server/evaluation');
	const { createQuoteFromSurvey } = await import('../src/lib/server/quotes/workflow');
	const { getQuote } = await import('../src/lib/server/repositories/quotes');
	const { getSurvey } = await import('../src/lib/server/repositories/surveys');
	const { DEMO, DEMO_PASSWORD } = await import('../tests/helpers/http');
	const { demoScenarioIds, demoSurveySteps } = await import('../tests/helpers/flows');

	const rep = await authenticate(DEMO.rep, DEMO_PASSWORD);
	if (!rep) throw new Error('the demo rep cannot sign in: run the seed first');
	const ids = await demoScenarioIds();
	const surveyId = await createSurvey({
		customerId: ids.customerId,
		siteId: ids.siteId,
		owner: rep,
		clientToken: randomUUID(),
		today: new Date().toISOString().slice(0, 10)
	});
	for (const [step, values] of Object.entries(demoSurveySteps(ids))) {
		const parsed = draftStepSchema(step as Parameters<typeof draftStepSchema>[0]).parse(values);
		await saveStep(
			surveyId,
			step as Parameters<typeof saveStep>[1],
			parsed as Record<string, unknown>
		);
	}
	const survey = await getSurvey(surveyId, rep);
	if (!survey.ok) throw new Error('the demo survey vanished');
	const built = buildEvaluateBody(survey.value.data);
	if (!built.ok) throw new Error(`the demo survey is incomplete: ${built.missing.join(', ')}`);
	const outcome = await runEvaluation(built.body);
	if (!outcome.ok) throw new Error(`the engine refused the demo survey: ${outcome.message}`);
	await chooseSetup(surveyId, rep, 'overhead-hoist', outcome.result, outcome.input);
	const made = await createQuoteFromSurvey(surveyId, rep, randomUUID());
	if (!made.ok) throw new Error(`no demo quote: ${made.message}`);
	const view = await getQuote(made.value, null);
	if (!view.ok) throw new Error('the demo quote vanished');
	return view.value;
}

export function printPdfFigures(x: PdfBenchFigures): void {
	console.log(
		`Quote PDF benchmark: the demo quote (${x.quoteLines} lines, ${x.quotePages} pages) against a one-page document`
	);
	console.log(`(median of ${x.rounds} builds each, same fonts; Node ${process.version})\n`);
	console.log(
		`  buildQuotePdf(demo quote)    ${x.quoteMs.toFixed(1).padStart(7)} ms  ${(x.quoteBytes / 1024).toFixed(0)} KB`
	);
	console.log(
		`  floor: one page, same fonts  ${x.floorMs.toFixed(1).padStart(7)} ms  ${(x.floorBytes / 1024).toFixed(0)} KB`
	);
	console.log(
		`  ratio quote ÷ floor          ${x.ratio.toFixed(2).padStart(7)}×    target ≤ ${x.targetRatio}×: ${x.meetsTarget ? 'met' : 'NOT met'}`
	);
}

if (process.argv[1] && import.meta.url === pathToFileURL(path.resolve(process.argv[1])).href) {
	const { sequelize } = await import('../src/lib/server/db');
	const { pdfSettings } = await import('../src/lib/server/quotes/workflow');
	try {
		printPdfFigures(await runPdfBench(await demoQuoteView(), await pdfSettings()));
	} finally {
		await sequelize.close();
	}
}
