/**
 * Rules-engine benchmark (issue 3): evaluations per second on the demo scenario (the DESIGN.md §4
 * example against seed-data/catalogue.json) and, in the same run, the floor: JSON.parse(
 * JSON.stringify(payload)) of the same payload. Aim: ≥ 20 000 evaluations/s and within 10× the floor.
 *
 *   npx tsx bench/engine.ts            (npm run bench:engine)
 *
 * `runEngineBench()` returns the figures for a combined benchmark.
 */
import { readFileSync } from 'node:fs';
import { fileURLToPath, pathToFileURL } from 'node:url';
import path from 'node:path';
import {
	DESIGN_EXAMPLE_REQUEST,
	evaluate,
	fromCatalogueFile,
	type CatalogueFile
} from '../src/lib/server/rules';
import { evaluateRequestSchema } from '../src/lib/schemas/evaluate';

export interface EngineBenchFigures {
	/** engine evaluations per second (median of rounds) */
	evaluationsPerSecond: number;
	/** JSON.parse(JSON.stringify(payload)) per second: the floor */
	floorOpsPerSecond: number;
	/** floor ÷ engine: how many times slower than the floor the engine is */
	ratio: number;
	/** schema parse + evaluate per second (what the route does per request) */
	parseAndEvaluatePerSecond: number;
	meanMicroseconds: number;
	payloadBytes: number;
	rounds: number;
	roundMs: number;
	targetEvaluationsPerSecond: number;
	targetRatio: number;
	meetsTargets: boolean;
}

const here = path.dirname(fileURLToPath(import.meta.url));

function opsPerSecond(fn: () => unknown, ms: number): number {
	// check the clock every 64 calls so timing costs stay out of the figure
	const start = performance.now();
	let n = 0;
	let now = start;
	do {
		for (let i = 0; i < 64; i++) fn();
		n += 64;
		now = performance.now();
	} while (now - start < ms);
	return (n * 1000) / (now - start);
}

function median(xs: number[]): number {
	const s = [...xs].sort((a, b) => a - b);
	const m = s.length >> 1;
	return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
}

export function runEngineBench(
	opts: { rounds?: number; roundMs?: number } = {}
): EngineBenchFigures {
	const rounds = opts.rounds ?? 5;
	const roundMs = opts.roundMs ?? 400;
	const file = JSON.parse(
		readFileSync(path.join(here, '..', 'seed-data', 'catalogue.json'), 'utf8')
	) as CatalogueFile;
	const { catalogue } = fromCatalogueFile(file);
	const payload = JSON.parse(
		JSON.stringify(DESIGN_EXAMPLE_REQUEST)
	) as typeof DESIGN_EXAMPLE_REQUEST;

	let sink = 0;
	const engine = () => {
		sink += evaluate(payload, catalogue).setups.length;
	};
	const floor = () => {
		sink += (JSON.parse(JSON.stringify(payload)) as { fleet: { trucks: number } }).fleet.trucks;
	};
	const route = () => {
		const parsed = evaluateRequestSchema.parse(payload);
		sink += evaluate(parsed as typeof payload, catalogue).setups.length;
	};

	// warm up the JIT on all three
	for (let i = 0; i < 3000; i++) {
		engine();
		floor();
		route();
	}
	const e: number[] = [];
	const f: number[] = [];
	const r: number[] = [];
	for (let k = 0; k < rounds; k++) {
		e.push(opsPerSecond(engine, roundMs));
		f.push(opsPerSecond(floor, roundMs));
		r.push(opsPerSecond(route, roundMs / 2));
	}
	if (sink === 42) console.log(''); // keep the work observable

	const evaluationsPerSecond = median(e);
	const floorOpsPerSecond = median(f);
	const ratio = floorOpsPerSecond / evaluationsPerSecond;
	return {
		evaluationsPerSecond,
		floorOpsPerSecond,
		ratio,
		parseAndEvaluatePerSecond: median(r),
		meanMicroseconds: 1e6 / evaluationsPerSecond,
		payloadBytes: Buffer.byteLength(JSON.stringify(payload)),
		rounds,
		roundMs,
		targetEvaluationsPerSecond: 20_000,
		targetRatio: 10,
		meetsTargets: evaluationsPerSecond >= 20_000 && ratio <= 10
	};
}

function printTable(x: EngineBenchFigures): void {
	const fmt = (n: number) => Math.round(n).toLocaleString('en-US');
	const rows: [string, string, string][] = [
		[
			'engine evaluate()',
			`${fmt(x.evaluationsPerSecond)} /s`,
			`${x.meanMicroseconds.toFixed(1)} µs each`
		],
		[
			'floor JSON.parse(JSON.stringify(payload))',
			`${fmt(x.floorOpsPerSecond)} /s`,
			`${x.payloadBytes} B payload`
		],
		['schema parse + evaluate()', `${fmt(x.parseAndEvaluatePerSecond)} /s`, 'what the route does'],
		['ratio floor ÷ engine', `${x.ratio.toFixed(2)}×`, `target ≤ ${x.targetRatio}×`]
	];
	const w0 = Math.max(...rows.map((r) => r[0].length));
	const w1 = Math.max(...rows.map((r) => r[1].length));
	console.log(`Rules engine benchmark: DESIGN.md §4 example against seed-data/catalogue.json`);
	console.log(`(median of ${x.rounds} rounds of ${x.roundMs} ms; Node ${process.version})\n`);
	for (const [a, b, c] of rows) console.log(`  ${a.padEnd(w0)}  ${b.padStart(w1)}  ${c}`);
	console.log(
		`\n  target ≥ ${fmt(x.targetEvaluationsPerSecond)} evaluations/s and within ${x.targetRatio}× the floor: ${x.meetsTargets ? 'met' : 'NOT met'}`
	);
}

if (process.argv[1] && import.meta.url === pathToFileURL(path.resolve(process.argv[1])).href) {
	printTable(runEngineBench());
}
