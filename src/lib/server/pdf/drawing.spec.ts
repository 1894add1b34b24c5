import PDFDocument from 'pdfkit';
import { describe, expect, it } from 'vitest';
import { compartmentScene } from '$lib/drawing/compartment';
import { drawCompartmentScene, niceScale } from './drawing';

const truck = {
	compartment: { lengthMm: 1050, widthMm: 860, heightMm: 640, heightWithRollerBedMm: 610 },
	rollerBedTopMm: 215,
	forkFit: {
		serviceTrolley: { maxLengthMm: 940 },
		latchTrolley: { minLengthMm: 1120, maxLengthMm: 1170 }
	}
};
const battery = { lengthMm: 1000, widthMm: 820, heightMm: 580 };

function render(draw: (doc: PDFKit.PDFDocument) => void): Promise<Buffer> {
	// uncompressed so the test can read the drawing operators
	const doc = new PDFDocument({ size: 'A4', margin: 36, compress: false });
	const chunks: Buffer[] = [];
	doc.on('data', (c: Buffer) => chunks.push(c));
	const done = new Promise<Buffer>((resolve) =>
		doc.on('end', () => resolve(Buffer.concat(chunks)))
	);
	draw(doc);
	doc.end();
	return done;
}

describe('niceScale', () => {
	it('takes the next preferred scale at or above the exact one', () => {
		expect(niceScale(20)).toBe(20);
		expect(niceScale(17.3)).toBe(20);
		expect(niceScale(20.01)).toBe(25);
		expect(niceScale(612)).toBe(700);
	});
});

describe('drawCompartmentScene', () => {
	it('draws a clash scene as vectors into a PDF', async () => {
		const scene = compartmentScene({
			truck,
			battery,
			setup: 'in-truck',
			palletTruck: { forkLengthMm: 1100 },
			checks: [
				{ code: 'fork-length', result: 'fail', measured: 1100, limit: 940, subject: 'pallet-truck' }
			]
		});
		let result: ReturnType<typeof drawCompartmentScene> | undefined;
		const pdf = await render((doc) => {
			doc.text('before', 36, 36);
			const y = doc.y;
			result = drawCompartmentScene(doc, scene, {
				x: 36,
				y: 60,
				width: 523,
				height: 320,
				system: 'metric'
			});
			// the caller's text position is left as it was
			expect(doc.y).toBe(y);
		});
		expect(pdf.subarray(0, 5).toString('latin1')).toBe('%PDF-');
		const body = pdf.toString('latin1');
		expect(body).toMatch(/ re\n/); // rectangles
		expect(body).toMatch(/ l\n/); // lines
		expect(body).toMatch(/W n\n/); // hatching clipped to the clash area
		expect(body).toMatch(/ c\n/); // circles (Bézier curves)
		expect(body).toMatch(/\[[^\]]*\] 0 d\n/); // dashed lines
		expect(body).toMatch(/T[jJ]\n/); // text
		// the drawing fits the box at a preferred scale: width in points = mm / n × 72 / 25.4
		const r = result!;
		const widthPt = ((scene.bbox.maxX - scene.bbox.minX) / r.scaleDenominator) * (72 / 25.4);
		expect(widthPt).toBeLessThanOrEqual(523 + 1e-6);
		expect([10, 12.5, 15, 20, 25, 30, 40, 50]).toContain(r.scaleDenominator);
		expect(r.pointsPerMm).toBeCloseTo(72 / 25.4 / r.scaleDenominator, 9);
		expect(r.usedHeight).toBeLessThanOrEqual(320);
	});

	it('states the exact scale when the box allows it: 2 000 mm in 100 mm of paper is 1:20', async () => {
		const scene = compartmentScene({
			truck,
			battery,
			setup: 'roller-bed',
			stand: null,
			checks: []
		});
		const widthMm = scene.bbox.maxX - scene.bbox.minX;
		// a box exactly 1:20 wide: widthMm / 20 mm of paper = widthMm / 20 × 72 / 25.4 pt
		const width = (widthMm / 20) * (72 / 25.4);
		let n = 0;
		await render((doc) => {
			n = drawCompartmentScene(doc, scene, {
				x: 36,
				y: 36,
				width,
				height: 2000,
				system: 'imperial'
			}).scaleDenominator;
		});
		expect(n).toBe(20);
	});
});
