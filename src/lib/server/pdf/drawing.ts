/**
 * The to-scale compartment drawing in the quote PDF (issue 5 item 6): the same scene as the
 * recommendation screen's SVG ($lib/drawing/compartment), drawn as pdfkit vectors: rectangles,
 * lines, circles and paths, hatching clipped to its area, text in the document's current font.
 */

import {
	DASH_EM,
	HATCH_EM,
	STROKE_EM,
	dimensionArrows,
	dimensionLine,
	labelLayout,
	scaleBarFor,
	sceneColours,
	sceneText,
	type CompartmentScene,
	type LabelPrimitive,
	type SceneFill,
	type SceneRole,
	type SceneTone,
	type SceneWeight
} from '$lib/drawing/compartment';
import type { UnitSystem } from '$lib/units';

export interface DrawSceneOptions {
	/** the box to draw in, PDF points from the page's top-left */
	x: number;
	y: number;
	width: number;
	height: number;
	system: UnitSystem;
	/** font for the labels (a registered name or a path), set on the document and left set; default:
	 * the document's current font */
	font?: string;
}

export interface DrawSceneResult {
	/** the drawing's scale on the printed page: 1 : `scaleDenominator` */
	scaleDenominator: number;
	/** points per millimetre of the scene */
	pointsPerMm: number;
	/** the space actually used, points, within the box */
	usedHeight: number;
}

/** 1 pt = 1/72 in = 25.4/72 mm on paper. */
const PAPER_MM_PER_PT = 25.4 / 72;

/** Preferred drawing scales (1 : n), the usual engineering series. */
const NICE_SCALES = [
	1, 2, 2.5, 5, 10, 12.5, 15, 20, 25, 30, 40, 50, 60, 75, 100, 125, 150, 200, 250, 300, 400, 500
];

/** The smallest preferred scale denominator at or above `n` (so the drawing fits the box). */
export function niceScale(n: number): number {
	for (const s of NICE_SCALES) if (s >= n - 1e-9) return s;
	return Math.ceil(n / 100) * 100;
}

const LEGEND_PT = 7.5;
const LEGEND_ROW_PT = 11;

/**
 * Draws the scene into the box, at the largest preferred scale (1:10, 1:15, 1:20 …) that fits with
 * the aspect ratio kept, with the legend and a scale note ("Scale 1:20 when printed at 100 %") under
 * it. Leaves the document's position (doc.x, doc.y) and font size as they were.
 */
export function drawCompartmentScene(
	doc: PDFKit.PDFDocument,
	scene: CompartmentScene,
	opts: DrawSceneOptions
): DrawSceneResult {
	const internal = doc as unknown as { _fontSize?: number };
	const savedFontSize = internal._fontSize ?? 12;
	const savedX = doc.x;
	const savedY = doc.y;
	if (opts.font) doc.font(opts.font);

	// legend rows first: they take the bottom of the box
	doc.fontSize(LEGEND_PT);
	const swatchW = 12;
	const items = scene.legend.map((e) => ({ e, w: swatchW + 4 + doc.widthOfString(e.label) + 12 }));
	const rows: (typeof items)[] = [[]];
	let rowW = 0;
	for (const it of items) {
		if (rowW + it.w > opts.width && rows[rows.length - 1].length > 0) {
			rows.push([]);
			rowW = 0;
		}
		rows[rows.length - 1].push(it);
		rowW += it.w;
	}
	const reserved = rows.length * LEGEND_ROW_PT + LEGEND_ROW_PT + 4;

	const b = scene.bbox;
	const bw = b.maxX - b.minX;
	const bh = b.maxY - b.minY;
	const fit = Math.min(opts.width / bw, Math.max(opts.height - reserved, 1) / bh);
	const scaleDenominator = niceScale(1 / (fit * PAPER_MM_PER_PT));
	const k = 1 / (scaleDenominator * PAPER_MM_PER_PT); // points per scene mm
	const drawW = bw * k;
	const drawH = bh * k;
	const ox = opts.x + (opts.width - drawW) / 2;
	const oy = opts.y;
	const X = (x: number) => ox + (x - b.minX) * k;
	const Y = (y: number) => oy + (b.maxY - y) * k;
	const t = scene.textMm;
	const lw = (w: SceneWeight) => Math.max(0.3, STROKE_EM[w] * t * k);

	doc.save();
	const stroke = (dashed: boolean | undefined) => {
		if (dashed) doc.dash(DASH_EM * t * k, { space: DASH_EM * t * k * 0.7 });
		doc.stroke();
		if (dashed) doc.undash();
	};
	const paint = (
		role: SceneRole,
		tone: SceneTone,
		fill: SceneFill,
		weight: SceneWeight,
		dashed: boolean | undefined
	) => {
		const c = sceneColours(role, tone);
		doc.lineWidth(lw(weight)).strokeColor(c.stroke);
		if (fill === 'none') {
			stroke(dashed);
			return;
		}
		doc.fillColor(fill === 'solid' ? c.fill : c.tint);
		if (dashed) doc.dash(DASH_EM * t * k, { space: DASH_EM * t * k * 0.7 });
		doc.fillAndStroke();
		if (dashed) doc.undash();
	};
	const hatch = (
		x: number,
		y: number,
		w: number,
		h: number,
		tone: SceneTone,
		dashed: boolean | undefined
	) => {
		const c = sceneColours(tone === 'caution' ? 'gap' : 'clash', tone);
		const px = X(x);
		const py = Y(y + h);
		const pw = w * k;
		const ph = h * k;
		doc.save();
		doc
			.rect(px, py, pw, ph)
			.fillColor(c.tint)
			.fillOpacity(dashed ? 0.6 : 0.9)
			.fill();
		doc.fillOpacity(1);
		doc.rect(px, py, pw, ph).clip();
		const step = HATCH_EM * t * k;
		doc.lineWidth(Math.max(0.3, step * 0.35)).strokeColor(c.stroke);
		for (let d = -ph; d < pw; d += step) {
			doc.moveTo(px + d, py + ph).lineTo(px + d + ph, py);
		}
		doc.stroke();
		doc.restore();
		doc.rect(px, py, pw, ph).lineWidth(lw('normal')).strokeColor(c.stroke);
		stroke(dashed);
	};
	const text = (l: LabelPrimitive) => {
		const layout = labelLayout(l, t);
		const size = layout.size * k;
		doc.fontSize(size);
		const c = sceneColours(l.role, l.tone);
		l.lines.forEach((line, i) => {
			const str = sceneText(line, opts.system);
			const w = doc.widthOfString(str);
			const px = X(l.x) - (l.anchor === 'end' ? w : l.anchor === 'middle' ? w / 2 : 0);
			const py = Y(layout.baselines[i]);
			// a white halo keeps the text readable over lines and hatching
			doc.save();
			doc
				.lineWidth(size * 0.18)
				.strokeColor('#ffffff')
				.lineJoin('round');
			doc.text(str, px, py, {
				lineBreak: false,
				baseline: 'alphabetic',
				stroke: true,
				fill: false
			});
			doc.restore();
			doc.fillColor(c.text).text(str, px, py, { lineBreak: false, baseline: 'alphabetic' });
		});
	};

	for (const p of scene.primitives) {
		switch (p.type) {
			case 'rect':
				doc.rect(X(p.x), Y(p.y + p.height), p.width * k, p.height * k);
				paint(p.role, p.tone, p.fill, p.weight, p.dashed);
				break;
			case 'line':
				doc.moveTo(X(p.x1), Y(p.y1)).lineTo(X(p.x2), Y(p.y2));
				doc
					.lineWidth(lw(p.weight))
					.strokeColor(sceneColours(p.role, p.tone).stroke)
					.lineCap('round');
				stroke(p.dashed);
				doc.lineCap('butt');
				break;
			case 'circle':
				doc.circle(X(p.cx), Y(p.cy), p.r * k);
				paint(p.role, p.tone, p.fill, p.weight, p.dashed);
				break;
			case 'clash':
				if (p.shape === 'area') {
					hatch(p.x, p.y, p.width, p.height, p.tone, p.dashed);
				} else {
					const c = sceneColours(p.role, p.tone);
					const r = (p.width / 2) * k;
					const cx = X(p.x);
					const cy = Y(p.y);
					doc.lineWidth(lw('heavy')).strokeColor(c.stroke).fillColor('#ffffff');
					doc.circle(cx, cy, r).fillAndStroke();
					const a = r * 0.55;
					doc
						.moveTo(cx - a, cy - a)
						.lineTo(cx + a, cy + a)
						.moveTo(cx - a, cy + a)
						.lineTo(cx + a, cy - a)
						.lineCap('round')
						.stroke();
					doc.lineCap('butt');
				}
				break;
			case 'dimension': {
				const ink = p.tone === 'normal' ? '#1c605d' : sceneColours(p.role, p.tone).stroke;
				doc.lineWidth(lw('thin')).strokeColor(ink);
				for (const e of p.extensions) doc.moveTo(X(e.x1), Y(e.y1)).lineTo(X(e.x2), Y(e.y2));
				if (p.leader)
					doc.moveTo(X(p.leader.x1), Y(p.leader.y1)).lineTo(X(p.leader.x2), Y(p.leader.y2));
				if (p.extensions.length > 0 || p.leader) doc.stroke();
				const dl = dimensionLine(p, t);
				doc
					.moveTo(X(dl.x1), Y(dl.y1))
					.lineTo(X(dl.x2), Y(dl.y2))
					.lineWidth(lw(p.tone === 'normal' ? 'thin' : 'normal'))
					.stroke();
				for (const tri of dimensionArrows(p, t)) {
					doc
						.polygon(...tri.map(([x, y]) => [X(x), Y(y)]))
						.fillColor(ink)
						.fill();
				}
				if (p.label) text(p.label);
				break;
			}
			case 'label':
				text(p);
				break;
		}
	}

	// scale bar, in the space the scene kept for it
	const bar = scaleBarFor(opts.system);
	const sx = X(scene.scaleBar.x);
	const sy = Y(scene.scaleBar.y);
	doc.lineWidth(lw('normal')).strokeColor('#1c605d');
	doc
		.moveTo(sx, sy)
		.lineTo(sx + bar.lengthMm * k, sy)
		.stroke();
	doc.lineWidth(lw('thin'));
	for (const tick of bar.ticksMm)
		doc.moveTo(sx + tick * k, sy).lineTo(sx + tick * k, sy - 0.4 * t * k);
	doc.stroke();
	doc.fontSize(0.85 * t * k).fillColor('#1c605d');
	doc.text(bar.label, sx + bar.lengthMm * k + 0.4 * t * k, sy, {
		lineBreak: false,
		baseline: 'alphabetic'
	});

	// legend and scale note under the drawing
	let ly = oy + drawH + 4;
	doc.fontSize(LEGEND_PT);
	for (const row of rows) {
		let lx = opts.x;
		for (const { e, w } of row) {
			const c = sceneColours(e.role, e.tone);
			if (e.swatch === 'hatch') {
				hatchSwatch(doc, lx, ly + 1, swatchW, 7, c.tint, c.stroke);
			} else {
				doc
					.rect(lx, ly + 1, swatchW, 7)
					.lineWidth(0.6)
					.strokeColor(c.stroke);
				doc.fillColor(e.role === 'frame' || e.role === 'forks' ? c.fill : c.tint).fillAndStroke();
			}
			doc.fillColor('#1e293b').text(e.label, lx + swatchW + 4, ly, { lineBreak: false });
			lx += w;
		}
		ly += LEGEND_ROW_PT;
	}
	doc
		.fillColor('#1e293b')
		.text(
			`Scale 1:${scaleDenominator} when printed at 100 %. Parts without a dimension are drawn to typical proportions.`,
			opts.x,
			ly,
			{
				lineBreak: false
			}
		);
	ly += LEGEND_ROW_PT;
	doc.restore();

	doc.fontSize(savedFontSize);
	doc.x = savedX;
	doc.y = savedY;
	return { scaleDenominator, pointsPerMm: k, usedHeight: ly - opts.y };
}

function hatchSwatch(
	doc: PDFKit.PDFDocument,
	x: number,
	y: number,
	w: number,
	h: number,
	tint: string,
	ink: string
): void {
	doc.save();
	doc.rect(x, y, w, h).fillColor(tint).fill();
	doc.rect(x, y, w, h).clip();
	doc.lineWidth(0.8).strokeColor(ink);
	for (let d = -h; d < w; d += 2.5) doc.moveTo(x + d, y + h).lineTo(x + d + h, y);
	doc.stroke();
	doc.restore();
	doc.rect(x, y, w, h).lineWidth(0.6).strokeColor(ink).stroke();
}
