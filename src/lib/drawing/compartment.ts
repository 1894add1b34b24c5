/**
 * The to-scale compartment drawing as a scene: a list of primitives in millimetres that the
 * recommendation screen (CompartmentDrawing.svelte, SVG) and the quote PDF (server/pdf/drawing.ts,
 * pdfkit) both render, so the two always show the same thing.
 *
 * The view is a side view across the truck, looking along the truck's length, in the direction the
 * battery leaves the compartment: x runs along the compartment's length (`compartment.lengthMm`, the
 * direction of side extraction) from the far frame wall (x = 0, on the left) to the side opening
 * (x = lengthMm, on the right); y is the height above the floor (y = 0), up is up. Everything the
 * engine measures is drawn from its real number; the few parts the specs do not size (wall and
 * plate thickness, trolley depth, fork blade thickness, roller diameters, the pallet truck's body,
 * the hoist) are drawn to the typical proportions in `DRAW` and carry no dimension.
 *
 * Browser-safe and pure: no imports except the units helpers. The input types are declared here
 * structurally; the engine's `TruckSpec`, `BatterySpec`, `SitePalletTruck`, `SiteRollerStand`,
 * `SiteCrane` and `Check` (server/rules/types.ts) are assignable to them.
 */

import { formatLength, type UnitSystem } from '$lib/units';
import { SETUP_LABELS } from '../labels';

// ---------------------------------------------------------------------------------------------
// Input

export type DrawingSetupId = 'in-truck' | 'roller-bed' | 'trolley-stand' | 'overhead-hoist';

/** The fields of the engine's `TruckSpec` the drawing reads. */
export interface DrawingTruck {
	compartment: {
		lengthMm: number;
		widthMm: number;
		heightMm: number;
		heightWithRollerBedMm: number;
	};
	/** roller tops of the roller bed above the floor, mm */
	rollerBedTopMm: number;
	forkFit: {
		serviceTrolley: { maxLengthMm: number };
		latchTrolley: { minLengthMm: number; maxLengthMm: number };
	};
}

/** The fields of the engine's `BatterySpec` the drawing reads. */
export interface DrawingBattery {
	lengthMm: number;
	widthMm: number;
	heightMm: number;
}

export interface DrawingPalletTruck {
	/** fork length measured from the heel (here: from the side opening), mm */
	forkLengthMm: number;
}

export interface DrawingStand {
	/** roller tops above the floor, mm */
	rollerTopMm: number;
	adjustRangeMm: { minMm: number; maxMm: number } | null;
	kind?: 'stand' | 'changer';
}

export interface DrawingCrane {
	ratedLoadKg: number;
	beamWeightKg?: number | null;
}

/** The fields of the engine's `Check` the drawing reads. */
export interface DrawingCheck {
	code: string;
	result: 'pass' | 'warn' | 'fail';
	measured: number | null;
	limit: number | null;
	subject?: string;
}

export interface CompartmentSceneInput {
	truck: DrawingTruck;
	battery: DrawingBattery;
	setup: DrawingSetupId;
	/** the site's pallet truck used for the setup; else the fork-length check's measured value */
	palletTruck?: DrawingPalletTruck | null;
	/** the site's roller stand or changer (roller-bed setup) */
	stand?: DrawingStand | null;
	/** the site's overhead hoist (overhead-hoist setup); null draws it dashed as missing */
	crane?: DrawingCrane | null;
	/** the setup's checks from the engine; failed and warned ones are drawn in place */
	checks: readonly DrawingCheck[];
}

// ---------------------------------------------------------------------------------------------
// Scene

export type SceneRole =
	| 'frame'
	| 'battery'
	| 'roller-bed'
	| 'stand'
	| 'rollers'
	| 'forks'
	| 'trolley'
	| 'hoist'
	| 'floor'
	| 'clash'
	| 'gap';

/** `normal` draws in the role's colours; `caution` (a warning) and `clash` (a failure) override. */
export type SceneTone = 'normal' | 'caution' | 'clash';

/** A piece of label text: literal text, or a length in mm shown in both unit systems. */
export type TextPart = string | { mm: number };
/** One line of label text. */
export type SceneText = readonly TextPart[];

interface PrimitiveBase {
	role: SceneRole;
	tone: SceneTone;
}

/** Fill styles: `solid` the role's strong colour, `tint` its light colour, `none` outline only. */
export type SceneFill = 'solid' | 'tint' | 'none';
export type SceneWeight = 'thin' | 'normal' | 'heavy';

export interface RectPrimitive extends PrimitiveBase {
	type: 'rect';
	/** lower-left corner, mm */
	x: number;
	y: number;
	width: number;
	height: number;
	fill: SceneFill;
	weight: SceneWeight;
	dashed?: boolean;
}

export interface LinePrimitive extends PrimitiveBase {
	type: 'line';
	x1: number;
	y1: number;
	x2: number;
	y2: number;
	weight: SceneWeight;
	dashed?: boolean;
}

export interface CirclePrimitive extends PrimitiveBase {
	type: 'circle';
	cx: number;
	cy: number;
	r: number;
	fill: SceneFill;
	weight: SceneWeight;
	dashed?: boolean;
}

export interface LabelPrimitive extends PrimitiveBase {
	type: 'label';
	/** anchor point: `x` per `anchor`, `y` the top of the text block, mm */
	x: number;
	y: number;
	anchor: 'start' | 'middle' | 'end';
	lines: SceneText[];
	size: 'normal' | 'small';
	bold?: boolean;
}

export interface DimensionPrimitive extends PrimitiveBase {
	type: 'dimension';
	/** the dimension line itself (already offset from the part), mm; arrows at both ends */
	x1: number;
	y1: number;
	x2: number;
	y2: number;
	/** the length the dimension states, mm */
	valueMm: number;
	/** `outside` when the span is too short for arrows inside: they point in from beyond the ends */
	arrows: 'inside' | 'outside';
	/** extension lines from the part to the dimension line */
	extensions: { x1: number; y1: number; x2: number; y2: number }[];
	/** placed label, or null when the value is told elsewhere */
	label: LabelPrimitive | null;
	/** leader line from the label to the dimension, when the label sits away from it */
	leader: { x1: number; y1: number; x2: number; y2: number } | null;
}

export interface ClashPrimitive extends PrimitiveBase {
	type: 'clash';
	/** `area`: a hatched region (x, y lower-left, width, height); `marker`: a circled cross centred
	 * on (x, y) of diameter `width` */
	shape: 'area' | 'marker';
	x: number;
	y: number;
	width: number;
	height: number;
	/** a missing part (forks too short): outlined dashed instead of filled */
	dashed?: boolean;
}

export type ScenePrimitive =
	| RectPrimitive
	| LinePrimitive
	| CirclePrimitive
	| LabelPrimitive
	| DimensionPrimitive
	| ClashPrimitive;

export interface SceneBox {
	minX: number;
	minY: number;
	maxX: number;
	maxY: number;
}

/** A problem a check found and the drawing shows, in words (for the SVG `<desc>` and captions). */
export interface SceneFinding {
	code: string;
	tone: Exclude<SceneTone, 'normal'>;
	text: SceneText;
}

export interface LegendEntry {
	role: SceneRole;
	tone: SceneTone;
	label: string;
	swatch: 'fill' | 'hatch' | 'line' | 'circle';
}

export interface CompartmentScene {
	setup: DrawingSetupId;
	/** drawing order: first drawn first */
	primitives: ScenePrimitive[];
	/** everything, labels and scale bar included, with a margin; mm */
	bbox: SceneBox;
	/** nominal text height, mm of the scene; renderers scale it with the drawing */
	textMm: number;
	title: SceneText;
	/** the drawing in words, one sentence a line, findings last */
	description: SceneText[];
	findings: SceneFinding[];
	legend: LegendEntry[];
	/** lower-left corner of the space kept for a scale bar (up to 520 mm long, one text line) */
	scaleBar: { x: number; y: number };
}

// ---------------------------------------------------------------------------------------------
// Drawing proportions and style

/**
 * Sizes the specs do not give, drawn to typical proportions (not measurements; never dimensioned).
 */
export const DRAW = Object.freeze({
	/** far frame wall and cover plate thickness */
	wallMm: 50,
	coverMm: 30,
	/** compartment bottom plate */
	plateMm: 20,
	/** lowest battery base drawn for a trolley setup, so trolley and forks fit below it */
	minTrolleySillMm: 140,
	/** trolley frame depth below the battery; the forks run inside it */
	trolleyDepthMm: 100,
	trolleyRollerRadiusMm: 20,
	/** fork blade inside the trolley band: bottom and top below the battery base */
	forkBottomBelowSillMm: 52,
	forkTopBelowSillMm: 8,
	bedRollerPitchMm: 125,
	maxBedRollerRadiusMm: 30,
	/** gap between the side opening and a stand or changer alongside */
	standGapMm: 80,
	standRollerRadiusMm: 25,
	standRollerPitchMm: 125,
	standLegWidthMm: 40,
	/** shortest stand drawn (a stand is drawn as long as the battery) */
	minStandLengthMm: 600,
	/** pallet truck body outside the opening */
	palletBackrestMm: 60,
	palletBodyLengthMm: 260,
	palletWheelRadiusMm: 70,
	/** lifting beam above the compartment's top, and its depth */
	hoistClearanceMm: 430,
	beamDepthMm: 70,
	hookRadiusMm: 35
});

/** Estimated advance width of a character, in text heights (digits and lower case, sans). */
const CHAR_EM = 0.56;
/** Line pitch, in text heights. */
const LINE_EM = 1.25;
/** Ascent of the first line's baseline below the block top, in text heights. */
const ASCENT_EM = 0.9;
/** Text height as a share of the geometry's width: about 12 px on a 700 px wide drawing. */
const TEXT_SHARE = 1 / 40;

/** Colours of a role and tone on white; text colours meet WCAG AA (4.5:1) on white. */
export interface SceneColours {
	stroke: string;
	/** strong fill (`solid`) */
	fill: string;
	/** light fill (`tint`) */
	tint: string;
	text: string;
}

const INK = '#1c605d'; // tide-700, 7.4:1 on white
const CAUTION = '#d97706'; // ember-500, 3.2:1: lines and fills only (graphics need 3:1)
const CAUTION_TEXT = '#92400e'; // ember-700, 7.1:1
const CLASH = '#b91c1c'; // 6.5:1

const ROLE_COLOURS: Record<SceneRole, SceneColours> = {
	frame: { stroke: '#163f3e', fill: INK, tint: '#d5f2ee', text: INK },
	battery: { stroke: '#334155', fill: '#94a3b8', tint: '#e2e8f0', text: '#1e293b' },
	'roller-bed': { stroke: '#1a4d4b', fill: '#46b2a9', tint: '#aee4dd', text: INK },
	rollers: { stroke: '#1a4d4b', fill: '#1f7873', tint: '#ffffff', text: INK },
	stand: { stroke: '#1a4d4b', fill: '#79cfc6', tint: '#eefaf8', text: INK },
	forks: { stroke: '#1e293b', fill: '#64748b', tint: '#cbd5e1', text: '#1e293b' },
	trolley: { stroke: '#475569', fill: '#94a3b8', tint: '#f8fafc', text: '#334155' },
	hoist: { stroke: '#334155', fill: '#64748b', tint: '#e2e8f0', text: '#334155' },
	floor: { stroke: '#475569', fill: '#94a3b8', tint: '#e2e8f0', text: '#334155' },
	clash: { stroke: CLASH, fill: CLASH, tint: '#fee2e2', text: CLASH },
	gap: { stroke: CAUTION, fill: CAUTION, tint: '#fdeac6', text: CAUTION_TEXT }
};

/** Colours for a primitive: its tone overrides its role's colours. */
export function sceneColours(role: SceneRole, tone: SceneTone): SceneColours {
	if (tone === 'clash') return ROLE_COLOURS.clash;
	if (tone === 'caution') return ROLE_COLOURS.gap;
	return ROLE_COLOURS[role];
}

/** Stroke width in text heights, by weight (renderers multiply by `textMm`). */
export const STROKE_EM: Readonly<Record<SceneWeight, number>> = {
	thin: 0.04,
	normal: 0.07,
	heavy: 0.13
};
/** Dash and gap length in text heights. */
export const DASH_EM = 0.35;
/** Spacing of hatch lines in text heights. */
export const HATCH_EM = 0.3;

// ---------------------------------------------------------------------------------------------
// Text helpers shared by the renderers

/** A line of scene text in the given system, lengths as "1 100 mm (43.3 in)" or the reverse. */
export function sceneText(text: SceneText, system: UnitSystem): string {
	return text.map((p) => (typeof p === 'string' ? p : formatLength(p.mm, system))).join('');
}

export interface LabelLayout {
	/** text height, mm */
	size: number;
	/** baseline y of each line, mm (y up) */
	baselines: number[];
	box: SceneBox;
}

/** Where a label's lines go: both renderers use this so the text lands where the scene planned. */
export function labelLayout(label: LabelPrimitive, textMm: number): LabelLayout {
	const size = textMm * (label.size === 'small' ? 0.85 : 1);
	const baselines = label.lines.map((_, i) => label.y - ASCENT_EM * size - i * LINE_EM * size);
	return { size, baselines, box: labelBox(label.lines, size, label.x, label.y, label.anchor) };
}

function textWidth(lines: readonly SceneText[], size: number): number {
	let chars = 0;
	for (const line of lines) {
		chars = Math.max(chars, sceneText(line, 'metric').length, sceneText(line, 'imperial').length);
	}
	return chars * CHAR_EM * size;
}

function labelBox(
	lines: readonly SceneText[],
	size: number,
	x: number,
	top: number,
	anchor: LabelPrimitive['anchor']
): SceneBox {
	const w = textWidth(lines, size);
	const h = (lines.length - 1) * LINE_EM * size + 1.15 * size;
	const minX = anchor === 'start' ? x : anchor === 'middle' ? x - w / 2 : x - w;
	return { minX, maxX: minX + w, minY: top - h, maxY: top };
}

/** The two arrowheads of a dimension as triangles [tip, base1, base2], mm. */
export function dimensionArrows(d: DimensionPrimitive, textMm: number): [number, number][][] {
	const len = Math.hypot(d.x2 - d.x1, d.y2 - d.y1);
	if (len === 0) return [];
	const ux = (d.x2 - d.x1) / len;
	const uy = (d.y2 - d.y1) / len;
	const a = ARROW_EM * textMm;
	const w = a * 0.35;
	// inside: tips at the ends pointing outward; outside: tips at the ends pointing inward
	const s = d.arrows === 'inside' ? 1 : -1;
	const head = (tx: number, ty: number, dir: number): [number, number][] => {
		const bx = tx - dir * s * ux * a;
		const by = ty - dir * s * uy * a;
		return [
			[tx, ty],
			[bx - uy * w, by + ux * w],
			[bx + uy * w, by - ux * w]
		];
	};
	return [head(d.x1, d.y1, -1), head(d.x2, d.y2, 1)];
}

/** The dimension line as drawn: outside arrows get a tail beyond each end. */
export function dimensionLine(
	d: DimensionPrimitive,
	textMm: number
): { x1: number; y1: number; x2: number; y2: number } {
	if (d.arrows === 'inside') return { x1: d.x1, y1: d.y1, x2: d.x2, y2: d.y2 };
	const len = Math.hypot(d.x2 - d.x1, d.y2 - d.y1) || 1;
	const ux = (d.x2 - d.x1) / len;
	const uy = (d.y2 - d.y1) / len;
	const t = ARROW_EM * textMm * 2;
	return { x1: d.x1 - ux * t, y1: d.y1 - uy * t, x2: d.x2 + ux * t, y2: d.y2 + uy * t };
}

const ARROW_EM = 0.5;

// ---------------------------------------------------------------------------------------------
// Builder

type Anchor = LabelPrimitive['anchor'];
type VAlign = 'top' | 'middle' | 'bottom';

interface LabelSpot {
	x: number;
	y: number;
	anchor: Anchor;
	valign: VAlign;
	/** draw a leader from the label to this point */
	leaderTo?: { x: number; y: number };
	/** the spot lies inside a part on purpose: only other labels must keep clear */
	inside?: boolean;
}

interface LabelRequest {
	lines: SceneText[];
	role: SceneRole;
	tone: SceneTone;
	size: LabelPrimitive['size'];
	bold: boolean;
	spots: LabelSpot[];
	/** lower runs first */
	priority: number;
	/** left out when no spot is clear */
	optional: boolean;
	order: number;
	dimension?: DimensionPrimitive;
}

function overlaps(a: SceneBox, b: SceneBox, pad = 0): boolean {
	return (
		a.minX < b.maxX + pad && b.minX < a.maxX + pad && a.minY < b.maxY + pad && b.minY < a.maxY + pad
	);
}

class SceneBuilder {
	readonly prims: ScenePrimitive[] = [];
	private readonly obstacles: { box: SceneBox; owner: DimensionPrimitive | null }[] = [];
	private readonly requests: LabelRequest[] = [];

	constructor(readonly t: number) {}

	rect(
		role: SceneRole,
		x: number,
		y: number,
		width: number,
		height: number,
		opts: {
			fill?: SceneFill;
			tone?: SceneTone;
			weight?: SceneWeight;
			dashed?: boolean;
			obstacle?: boolean;
		} = {}
	): RectPrimitive {
		// normalise negative sizes so renderers get a lower-left corner
		const x0 = Math.min(x, x + width);
		const y0 = Math.min(y, y + height);
		const r: RectPrimitive = {
			type: 'rect',
			role,
			tone: opts.tone ?? 'normal',
			x: x0,
			y: y0,
			width: Math.abs(width),
			height: Math.abs(height),
			fill: opts.fill ?? 'tint',
			weight: opts.weight ?? 'normal'
		};
		if (opts.dashed) r.dashed = true;
		this.prims.push(r);
		if (opts.obstacle !== false)
			this.obstacle({ minX: x0, minY: y0, maxX: x0 + r.width, maxY: y0 + r.height });
		return r;
	}

	line(
		role: SceneRole,
		x1: number,
		y1: number,
		x2: number,
		y2: number,
		opts: { tone?: SceneTone; weight?: SceneWeight; dashed?: boolean; obstacle?: boolean } = {}
	): LinePrimitive {
		const l: LinePrimitive = {
			type: 'line',
			role,
			tone: opts.tone ?? 'normal',
			x1,
			y1,
			x2,
			y2,
			weight: opts.weight ?? 'normal'
		};
		if (opts.dashed) l.dashed = true;
		this.prims.push(l);
		if (opts.obstacle) this.obstacle(lineBox(x1, y1, x2, y2, this.t * 0.1));
		return l;
	}

	circle(
		role: SceneRole,
		cx: number,
		cy: number,
		r: number,
		opts: { fill?: SceneFill; tone?: SceneTone; weight?: SceneWeight; dashed?: boolean } = {}
	): CirclePrimitive {
		const c: CirclePrimitive = {
			type: 'circle',
			role,
			tone: opts.tone ?? 'normal',
			cx,
			cy,
			r,
			fill: opts.fill ?? 'tint',
			weight: opts.weight ?? 'thin'
		};
		if (opts.dashed) c.dashed = true;
		this.prims.push(c);
		return c;
	}

	clashArea(
		x: number,
		y: number,
		width: number,
		height: number,
		tone: Exclude<SceneTone, 'normal'>,
		dashed = false
	): ClashPrimitive {
		const c: ClashPrimitive = {
			type: 'clash',
			role: tone === 'clash' ? 'clash' : 'gap',
			tone,
			shape: 'area',
			x: Math.min(x, x + width),
			y: Math.min(y, y + height),
			width: Math.abs(width),
			height: Math.abs(height)
		};
		if (dashed) c.dashed = true;
		this.prims.push(c);
		return c;
	}

	marker(x: number, y: number, tone: Exclude<SceneTone, 'normal'>): ClashPrimitive {
		const size = this.t * 1.1;
		const c: ClashPrimitive = {
			type: 'clash',
			role: tone === 'clash' ? 'clash' : 'gap',
			tone,
			shape: 'marker',
			x,
			y,
			width: size,
			height: size
		};
		this.prims.push(c);
		this.obstacle({
			minX: x - size / 2,
			maxX: x + size / 2,
			minY: y - size / 2,
			maxY: y + size / 2
		});
		return c;
	}

	/** A box labels keep clear of; a dimension's own lines do not push its label away. */
	obstacle(box: SceneBox, owner: DimensionPrimitive | null = null): void {
		this.obstacles.push({ box, owner });
	}

	/**
	 * A dimension between two points along x (`horizontal`) or y (`vertical`), its line at `at` (the
	 * other coordinate). Extension lines run from each point to the line unless `noExtensions`.
	 */
	dimension(
		orientation: 'horizontal' | 'vertical',
		from: number,
		to: number,
		at: number,
		opts: {
			role?: SceneRole;
			tone?: SceneTone;
			lines?: SceneText[] | null;
			/** the measured points the extension lines start from (other coordinate) */
			extFrom?: [number, number];
			spots?: LabelSpot[];
			priority?: number;
		} = {}
	): DimensionPrimitive {
		const t = this.t;
		const a = Math.min(from, to);
		const b = Math.max(from, to);
		const span = b - a;
		const horizontal = orientation === 'horizontal';
		const d: DimensionPrimitive = {
			type: 'dimension',
			role: opts.role ?? 'frame',
			tone: opts.tone ?? 'normal',
			x1: horizontal ? a : at,
			y1: horizontal ? at : a,
			x2: horizontal ? b : at,
			y2: horizontal ? at : b,
			valueMm: span,
			arrows: span < ARROW_EM * t * 2.6 ? 'outside' : 'inside',
			extensions: [],
			label: null,
			leader: null
		};
		if (opts.extFrom) {
			const over = t * 0.3;
			const [fa, fb] = opts.extFrom;
			for (const [p, f] of [
				[a, fa],
				[b, fb]
			] as const) {
				const dir = Math.sign(at - f) || 1;
				if (Math.abs(at - f) < t * 0.05) continue;
				d.extensions.push(
					horizontal
						? { x1: p, y1: f + dir * t * 0.15, x2: p, y2: at + dir * over }
						: { x1: f + dir * t * 0.15, y1: p, x2: at + dir * over, y2: p }
				);
			}
		}
		this.prims.push(d);
		const dl = dimensionLine(d, t);
		this.obstacle(lineBox(dl.x1, dl.y1, dl.x2, dl.y2, t * 0.25), d);
		for (const e of d.extensions) this.obstacle(lineBox(e.x1, e.y1, e.x2, e.y2, t * 0.05), d);
		const lines = opts.lines === undefined ? [[{ mm: span }]] : opts.lines;
		if (lines) {
			const mid = (a + b) / 2;
			const g = t * 0.3;
			const spots: LabelSpot[] =
				opts.spots ??
				(horizontal
					? [
							{ x: mid, y: at + g, anchor: 'middle', valign: 'bottom' },
							{ x: mid, y: at - g, anchor: 'middle', valign: 'top' },
							{ x: dl.x1 - g, y: at, anchor: 'end', valign: 'middle' },
							{ x: dl.x2 + g, y: at, anchor: 'start', valign: 'middle' }
						]
					: [
							{ x: at - g * 1.3, y: mid, anchor: 'end', valign: 'middle' },
							{ x: at + g * 1.3, y: mid, anchor: 'start', valign: 'middle' },
							{ x: at - g, y: dl.y2 + g, anchor: 'end', valign: 'bottom' },
							{ x: at - g, y: dl.y1 - g, anchor: 'end', valign: 'top' }
						]);
			this.requests.push({
				lines,
				role: d.role,
				tone: d.tone,
				size: 'normal',
				bold: d.tone !== 'normal',
				spots,
				priority: opts.priority ?? (d.tone === 'normal' ? 2 : 0),
				optional: false,
				order: this.requests.length,
				dimension: d
			});
		}
		return d;
	}

	label(
		lines: SceneText[],
		spots: LabelSpot[],
		opts: {
			role?: SceneRole;
			tone?: SceneTone;
			size?: LabelPrimitive['size'];
			bold?: boolean;
			priority?: number;
			optional?: boolean;
		} = {}
	): void {
		this.requests.push({
			lines,
			role: opts.role ?? 'frame',
			tone: opts.tone ?? 'normal',
			size: opts.size ?? 'normal',
			bold: opts.bold ?? false,
			spots,
			priority: opts.priority ?? 3,
			optional: opts.optional ?? false,
			order: this.requests.length
		});
	}

	/** Places the queued labels, most important first, each at its first spot clear of the others. */
	placeLabels(): void {
		const t = this.t;
		const queue = [...this.requests].sort((a, b) => a.priority - b.priority || a.order - b.order);
		const placed: SceneBox[] = [];
		for (const r of queue) {
			const size = t * (r.size === 'small' ? 0.85 : 1);
			const h = (r.lines.length - 1) * LINE_EM * size + 1.15 * size;
			let chosen: { spot: LabelSpot; top: number; box: SceneBox } | null = null;
			let fallback: { spot: LabelSpot; top: number; box: SceneBox } | null = null;
			for (const spot of r.spots) {
				const top =
					spot.valign === 'top' ? spot.y : spot.valign === 'bottom' ? spot.y + h : spot.y + h / 2;
				const box = labelBox(r.lines, size, spot.x, top, spot.anchor);
				fallback ??= { spot, top, box };
				const hit =
					placed.some((p) => overlaps(p, box, t * 0.15)) ||
					(!spot.inside &&
						this.obstacles.some((o) => o.owner !== r.dimension && overlaps(o.box, box)));
				if (!hit) {
					chosen = { spot, top, box };
					break;
				}
			}
			const c = chosen ?? (r.optional ? null : fallback);
			if (!c) continue;
			const label: LabelPrimitive = {
				type: 'label',
				role: r.role,
				tone: r.tone,
				x: c.spot.x,
				y: c.top,
				anchor: c.spot.anchor,
				lines: r.lines,
				size: r.size
			};
			if (r.bold) label.bold = true;
			placed.push(c.box);
			const to = c.spot.leaderTo;
			const leader = to ? leaderLine(c.box, to, t) : null;
			if (r.dimension) {
				r.dimension.label = label;
				r.dimension.leader = leader;
			} else {
				this.prims.push(label);
				if (leader)
					this.prims.push({ type: 'line', role: r.role, tone: r.tone, ...leader, weight: 'thin' });
			}
		}
	}

	bbox(extra: SceneBox[]): SceneBox {
		const b: SceneBox = { minX: Infinity, minY: Infinity, maxX: -Infinity, maxY: -Infinity };
		const add = (x: number, y: number) => {
			b.minX = Math.min(b.minX, x);
			b.maxX = Math.max(b.maxX, x);
			b.minY = Math.min(b.minY, y);
			b.maxY = Math.max(b.maxY, y);
		};
		const addBox = (o: SceneBox) => {
			add(o.minX, o.minY);
			add(o.maxX, o.maxY);
		};
		for (const p of this.prims) {
			for (const box of primitiveBoxes(p, this.t)) addBox(box);
		}
		for (const e of extra) addBox(e);
		return b;
	}
}

function lineBox(x1: number, y1: number, x2: number, y2: number, pad: number): SceneBox {
	return {
		minX: Math.min(x1, x2) - pad,
		maxX: Math.max(x1, x2) + pad,
		minY: Math.min(y1, y2) - pad,
		maxY: Math.max(y1, y2) + pad
	};
}

function leaderLine(
	box: SceneBox,
	to: { x: number; y: number },
	t: number
): { x1: number; y1: number; x2: number; y2: number } {
	const x = Math.min(Math.max(to.x, box.minX), box.maxX);
	const y = Math.min(Math.max(to.y, box.minY - t * 0.1), box.maxY);
	return { x1: x, y1: y, x2: to.x, y2: to.y };
}

/** Boxes a primitive covers, mm. */
export function primitiveBoxes(p: ScenePrimitive, textMm: number): SceneBox[] {
	switch (p.type) {
		case 'rect':
		case 'clash':
			return p.type === 'clash' && p.shape === 'marker'
				? [
						{
							minX: p.x - p.width / 2,
							maxX: p.x + p.width / 2,
							minY: p.y - p.height / 2,
							maxY: p.y + p.height / 2
						}
					]
				: [{ minX: p.x, minY: p.y, maxX: p.x + p.width, maxY: p.y + p.height }];
		case 'line':
			return [lineBox(p.x1, p.y1, p.x2, p.y2, 0)];
		case 'circle':
			return [{ minX: p.cx - p.r, maxX: p.cx + p.r, minY: p.cy - p.r, maxY: p.cy + p.r }];
		case 'label':
			return [labelLayout(p, textMm).box];
		case 'dimension': {
			const l = dimensionLine(p, textMm);
			const out = [lineBox(l.x1, l.y1, l.x2, l.y2, 0)];
			for (const e of p.extensions) out.push(lineBox(e.x1, e.y1, e.x2, e.y2, 0));
			if (p.label) out.push(labelLayout(p.label, textMm).box);
			if (p.leader) out.push(lineBox(p.leader.x1, p.leader.y1, p.leader.x2, p.leader.y2, 0));
			return out;
		}
	}
}

// ---------------------------------------------------------------------------------------------
// The scene

const SETUP_TITLES = SETUP_LABELS as Record<DrawingSetupId, string>;

function toneOf(c: DrawingCheck | undefined): SceneTone {
	if (!c) return 'normal';
	return c.result === 'fail' ? 'clash' : c.result === 'warn' ? 'caution' : 'normal';
}

function findCheck(
	checks: readonly DrawingCheck[],
	code: string,
	subject?: string
): DrawingCheck | undefined {
	return checks.find((c) => c.code === code && (subject === undefined || c.subject === subject));
}

/** A length is meaningfully more than zero (drawing tolerance: a tenth of a millimetre). */
const EPS = 0.1;

/**
 * Builds the to-scale side view of the compartment for one setup. Pure and deterministic: the
 * same input gives the same scene.
 *
 * Heights: the battery of a trolley setup stands on the compartment's floor; with a roller bed it
 * stands on the roller tops at `rollerBedTopMm`, and the bed takes `heightMm −
 * heightWithRollerBedMm` of the height, so the floor is drawn that much below the roller tops.
 * Fork lengths are measured from the side opening; the far frame at fork level sits where the
 * truck's `forkFit` stops the forks (the service trolley's maximum, or the latch adapter's).
 */
export function compartmentScene(input: CompartmentSceneInput): CompartmentScene {
	const { truck, battery, setup, checks } = input;
	const L = truck.compartment.lengthMm;
	const H = truck.compartment.heightMm;
	const bedThk = Math.max(0, H - truck.compartment.heightWithRollerBedMm);
	const bedTop = truck.rollerBedTopMm;
	const rollerBed = setup === 'roller-bed';
	const trolleyKind: 'service' | 'latch' | null =
		setup === 'in-truck' ? 'service' : rollerBed ? null : 'latch';
	const bl = battery.lengthMm;
	const bh = battery.heightMm;

	// text height from the geometry's width: compartment, a stand or pallet truck alongside, forks behind
	const geomWidth =
		L +
		DRAW.wallMm +
		(rollerBed ? DRAW.standGapMm + Math.max(bl, DRAW.minStandLengthMm) : 700) +
		300;
	// …but never so large that the compartment's own length label outgrows the compartment
	const t = Math.round(Math.max(Math.min(geomWidth * TEXT_SHARE, L / 20), 20));
	const s = new SceneBuilder(t);
	const findings: SceneFinding[] = [];

	// --- the compartment ---
	const sill = rollerBed
		? Math.max(0, bedTop - bedThk)
		: Math.max(bedTop - bedThk, DRAW.minTrolleySillMm);
	const top = sill + H;
	const base = rollerBed ? bedTop : sill; // where the battery stands
	const usable = rollerBed ? truck.compartment.heightWithRollerBedMm : H;
	const usableTop = base + usable;
	const plateTop = rollerBed ? sill : sill - DRAW.trolleyDepthMm;
	const hoist = setup === 'overhead-hoist';

	// floor
	const floorLeft = -DRAW.wallMm - t * 4;
	let floorRight =
		L + (rollerBed ? DRAW.standGapMm + Math.max(bl, DRAW.minStandLengthMm) : 700) + t * 2;
	s.rect('floor', floorLeft, -t * 0.3, 1, t * 0.3, {
		fill: 'tint',
		weight: 'thin',
		obstacle: false
	}); // width fixed below
	s.obstacle({ minX: -Infinity, maxX: Infinity, minY: -t * 0.3, maxY: 0 });

	// fork-level far frame (trolley setups): where the truck's fork fit stops the forks
	const fit = truck.forkFit;
	const stopLen =
		trolleyKind === 'service'
			? fit.serviceTrolley.maxLengthMm
			: trolleyKind === 'latch'
				? fit.latchTrolley.maxLengthMm
				: 0;
	const stopX = L - stopLen;
	const frameLeft = trolleyKind ? Math.min(-DRAW.wallMm, stopX - DRAW.wallMm) : -DRAW.wallMm;

	s.rect('frame', frameLeft, plateTop - DRAW.plateMm, L - frameLeft, DRAW.plateMm, {
		fill: 'solid'
	});
	s.rect(
		'frame',
		-DRAW.wallMm,
		rollerBed ? plateTop - DRAW.plateMm : sill,
		DRAW.wallMm,
		top + DRAW.coverMm - (rollerBed ? plateTop - DRAW.plateMm : sill),
		{
			fill: 'solid'
		}
	);
	s.rect('frame', -DRAW.wallMm, top, L + DRAW.wallMm, DRAW.coverMm, {
		fill: hoist ? 'none' : 'solid',
		dashed: hoist
	});
	s.line('frame', L, plateTop, L, top, { dashed: true, weight: 'thin' });

	// --- roller bed ---
	if (rollerBed) {
		const r = bedThk > 0 ? Math.min(DRAW.maxBedRollerRadiusMm, bedThk / 2) : 12;
		s.rect('roller-bed', 0, sill, L, Math.max(0, bedTop - r - sill), {
			fill: 'tint',
			weight: 'thin',
			obstacle: false
		});
		for (let x = DRAW.bedRollerPitchMm / 2; x < L - r; x += DRAW.bedRollerPitchMm) {
			s.circle('rollers', x, bedTop - r, r, { fill: 'tint' });
		}
	}

	// --- trolley and forks ---
	const forkCheck = findCheck(checks, 'fork-length');
	const forkLen = trolleyKind
		? (input.palletTruck?.forkLengthMm ?? forkCheck?.measured ?? null)
		: null;
	const forkTone = toneOf(forkCheck);
	const forkBottom = sill - DRAW.forkBottomBelowSillMm;
	const forkTop = sill - DRAW.forkTopBelowSillMm;
	const forkMid = (forkBottom + forkTop) / 2;
	if (trolleyKind) {
		const tb = sill - DRAW.trolleyDepthMm;
		s.rect('trolley', 0, tb, bl, DRAW.trolleyDepthMm, { fill: 'tint', weight: 'normal' });
		const rr = DRAW.trolleyRollerRadiusMm;
		const xs =
			trolleyKind === 'service'
				? [rr * 3, bl - rr * 3]
				: [rr * 3, bl / 3, (2 * bl) / 3, bl - rr * 3];
		for (const x of xs) s.circle('trolley', x, tb + rr, rr, { fill: 'solid' });
	}

	// --- battery ---
	s.rect('battery', 0, base, bl, bh, { fill: 'tint', weight: 'normal' });
	const batteryLines: SceneText[] = [['Battery'], ['L ', { mm: bl }], ['H ', { mm: bh }]];
	s.label(
		batteryLines,
		[
			{ x: Math.min(bl, L) / 2, y: base + bh / 2, anchor: 'middle', valign: 'middle' },
			{ x: Math.min(bl, L) / 2, y: base + bh - t * 0.4, anchor: 'middle', valign: 'top' }
		],
		{ role: 'battery', priority: 1 }
	);
	if (trolleyKind) {
		// where the forks must stop: the far frame at fork level
		s.line('frame', stopX, plateTop - DRAW.plateMm, stopX, sill, {
			weight: 'heavy',
			tone: forkTone === 'clash' && forkLen !== null && forkLen > stopLen ? 'clash' : 'normal'
		});
	}
	// the label sits inside the battery: only the other labels must keep out
	s.obstacle({ minX: 0, maxX: bl, minY: base, maxY: base + bh });

	// --- compartment fit: height, length, width, play ---
	const heightCheck = findCheck(checks, 'compartment-fit', 'height');
	const heightOver = bh - usable;
	const heightTone: SceneTone =
		heightOver > EPS
			? toneOf(heightCheck) === 'normal'
				? 'clash'
				: toneOf(heightCheck)
			: 'normal';
	if (heightOver > EPS) {
		s.clashArea(
			0,
			usableTop,
			Math.min(bl, L),
			heightOver,
			heightTone === 'caution' ? 'caution' : 'clash'
		);
		findings.push({
			code: 'compartment-fit',
			tone: heightTone === 'caution' ? 'caution' : 'clash',
			text: [
				`The battery is `,
				{ mm: heightOver },
				` higher than the `,
				{ mm: usable },
				rollerBed ? ` usable above the roller bed.` : ` the compartment takes.`
			]
		});
	}
	const lengthCheck = findCheck(checks, 'compartment-fit', 'length');
	const lengthOver = bl - L;
	if (lengthOver > EPS) {
		const tone = toneOf(lengthCheck) === 'caution' ? 'caution' : 'clash';
		s.clashArea(L, base, lengthOver, bh, tone);
		findings.push({
			code: 'compartment-fit',
			tone,
			text: [`The battery is `, { mm: lengthOver }, ` longer than the `, { mm: L }, ` compartment.`]
		});
	}
	const widthOver = battery.widthMm - truck.compartment.widthMm;
	if (widthOver > EPS) {
		const tone =
			toneOf(findCheck(checks, 'compartment-fit', 'width')) === 'caution' ? 'caution' : 'clash';
		findings.push({
			code: 'compartment-fit',
			tone,
			text: [
				`The battery is `,
				{ mm: widthOver },
				` wider than the `,
				{ mm: truck.compartment.widthMm },
				` compartment (across this view, not drawn).`
			]
		});
		s.label(
			[['Battery ', { mm: widthOver }], ['too wide (not in this view)']],
			[{ x: Math.min(bl, L) / 2, y: base + t * 0.4, anchor: 'middle', valign: 'bottom' }],
			{
				tone,
				role: 'clash',
				bold: true,
				priority: 0
			}
		);
	}
	const playCheck = findCheck(checks, 'compartment-fit', 'play');
	const playLimit = playCheck?.limit ?? 13;
	const playLen = L - bl;
	// play is drawn where the engine's check warned (or failed) about it
	const playTone: SceneTone = playLen > playLimit + EPS ? toneOf(playCheck) : 'normal';
	if (playTone !== 'normal') {
		s.clashArea(bl, base, playLen, bh, playTone === 'clash' ? 'clash' : 'caution');
		findings.push({
			code: 'compartment-fit',
			tone: playTone === 'clash' ? 'clash' : 'caution',
			text: [
				`The battery leaves `,
				{ mm: playLen },
				` of play at the side opening, more than `,
				{ mm: playLimit },
				`; spacers must take it up.`
			]
		});
	} else if (
		playCheck &&
		playCheck.result !== 'pass' &&
		(playCheck.measured ?? 0) > playLen + EPS
	) {
		// the play is across the compartment's width, which this view does not show
		findings.push({
			code: 'compartment-fit',
			tone: toneOf(playCheck) === 'clash' ? 'clash' : 'caution',
			text: [
				`The battery leaves `,
				{ mm: playCheck.measured ?? 0 },
				` of play across the compartment's width (not drawn), more than `,
				{ mm: playLimit },
				`; spacers must take it up.`
			]
		});
	}

	// --- stand or changer alongside (side transfer) ---
	const standCheck = findCheck(checks, 'roller-height');
	let standRight = L;
	if (rollerBed) {
		const stand = input.stand ?? null;
		const x0 = L + DRAW.standGapMm;
		const sl = Math.max(bl, DRAW.minStandLengthMm);
		standRight = x0 + sl;
		const name = stand?.kind === 'changer' ? 'Battery changer' : 'Roller stand';
		if (stand) {
			const rt = stand.rollerTopMm;
			const rr = DRAW.standRollerRadiusMm;
			if (stand.adjustRangeMm) {
				const { minMm, maxMm } = stand.adjustRangeMm;
				s.rect('stand', x0 - t * 0.2, minMm, sl + t * 0.4, Math.max(maxMm - minMm, 1), {
					fill: 'tint',
					weight: 'thin',
					dashed: true,
					obstacle: false
				});
			}
			const railTop = rt - rr;
			const railH = Math.min(rr, Math.max(railTop, 0));
			s.rect('stand', x0, railTop - railH, sl, railH, { fill: 'solid', weight: 'thin' });
			for (let x = x0 + DRAW.standRollerPitchMm / 2; x < x0 + sl; x += DRAW.standRollerPitchMm) {
				s.circle('rollers', x, rt - rr, rr, { fill: 'tint' });
			}
			const legTop = railTop - railH;
			if (legTop > 0) {
				s.rect('stand', x0 + t * 0.2, 0, DRAW.standLegWidthMm, legTop, {
					fill: 'solid',
					weight: 'thin'
				});
				s.rect('stand', x0 + sl - t * 0.2 - DRAW.standLegWidthMm, 0, DRAW.standLegWidthMm, legTop, {
					fill: 'solid',
					weight: 'thin'
				});
			}
			// rail and rollers keep labels off; the space between the legs stays free for the name
			s.obstacle({ minX: x0, maxX: x0 + sl, minY: legTop, maxY: rt });

			// stand roller height from the floor, right of the stand
			const lines: SceneText[] = [[name, ' rollers'], [{ mm: rt }]];
			if (stand.adjustRangeMm)
				lines.push(
					['adjustable ', { mm: stand.adjustRangeMm.minMm }],
					['to ', { mm: stand.adjustRangeMm.maxMm }]
				);
			s.dimension('vertical', 0, rt, x0 + sl + t * 1.2, {
				extFrom: [x0 + sl, x0 + sl],
				lines,
				spots: [
					{ x: x0 + sl + t * 1.6, y: rt / 2, anchor: 'start', valign: 'middle' },
					{ x: x0 + sl + t * 1.6, y: 0, anchor: 'start', valign: 'bottom' },
					{ x: x0 + sl + t * 1.6, y: rt, anchor: 'start', valign: 'bottom' }
				]
			});

			// the step between the roller bed and the stand, at the opening
			const diff = rt - bedTop;
			const tone = toneOf(standCheck);
			if (Math.abs(diff) > EPS) {
				const gx = L + DRAW.standGapMm / 2;
				s.line('gap', L - t * 0.6, bedTop, gx + t * 0.5, bedTop, {
					weight: 'thin',
					dashed: true,
					tone
				});
				s.line('gap', x0, rt, gx - t * 0.5, rt, { weight: 'thin', dashed: true, tone });
				const hi = Math.max(rt, bedTop);
				s.dimension('vertical', bedTop, rt, gx, {
					role: 'gap',
					tone,
					lines: [[{ mm: Math.abs(diff) }], [`${diff > 0 ? 'above' : 'below'} the roller bed`]],
					spots: [
						{
							x: x0 + t * 0.3,
							y: hi + t * 1.2,
							anchor: 'start',
							valign: 'bottom',
							leaderTo: { x: gx, y: hi + t * 0.3 }
						},
						{
							x: x0 + t * 0.3,
							y: hi + t * 3.2,
							anchor: 'start',
							valign: 'bottom',
							leaderTo: { x: gx, y: hi + t * 0.3 }
						},
						{
							x: gx,
							y: hi + t * 1.6,
							anchor: 'start',
							valign: 'bottom',
							leaderTo: { x: gx, y: hi + t * 0.3 }
						}
					],
					priority: 0
				});
				if (tone !== 'normal') {
					findings.push({
						code: 'roller-height',
						tone: tone === 'clash' ? 'clash' : 'caution',
						text: [
							`The ${name.toLowerCase()}'s rollers stand at `,
							{ mm: rt },
							`, `,
							{ mm: Math.abs(diff) },
							` ${diff > 0 ? 'above' : 'below'} the roller bed's `,
							{ mm: bedTop },
							stand.adjustRangeMm ? `, outside their adjustable range.` : `.`
						]
					});
				}
			}
			const standLabelSpots: LabelSpot[] = [];
			if (legTop > t * 1.6)
				standLabelSpots.push({
					x: x0 + sl / 2,
					y: legTop - t * 0.25,
					anchor: 'middle',
					valign: 'top'
				});
			standLabelSpots.push({
				x: x0 + sl / 2,
				y: Math.max(rt, stand.adjustRangeMm?.maxMm ?? 0) + t * 0.5,
				anchor: 'middle',
				valign: 'bottom'
			});
			s.label([[name, stand.kind === 'changer' ? '' : ' (site)']], standLabelSpots, {
				role: 'stand',
				priority: 3
			});
		} else {
			// nothing to transfer onto: show where a stand must meet the bed
			s.rect('stand', x0, bedTop - DRAW.standRollerRadiusMm * 2, sl, DRAW.standRollerRadiusMm * 2, {
				fill: 'none',
				dashed: true,
				tone: 'clash'
			});
			s.label(
				[['No roller stand or changer surveyed:'], ['rollers needed at ', { mm: bedTop }]],
				[{ x: x0, y: bedTop + t * 0.8, anchor: 'start', valign: 'bottom' }],
				{
					role: 'clash',
					tone: 'clash',
					bold: true,
					priority: 0
				}
			);
			findings.push({
				code: 'roller-height',
				tone: 'clash',
				text: [
					`The site has no roller stand or changer; side transfer needs rollers at `,
					{ mm: bedTop },
					`.`
				]
			});
		}
	}

	// --- pallet truck forks (trolley setups) ---
	const rows: number[] = [-t * 1.9, -t * 3.9, -t * 5.9];
	let lowest = -t * 0.3;
	if (trolleyKind) {
		const trolleyName =
			trolleyKind === 'service' ? 'the 2-roller service trolley' : 'the latch adapter';
		if (forkLen !== null) {
			const tip = L - forkLen;
			s.rect('forks', tip, forkBottom, forkLen, forkTop - forkBottom, {
				fill: 'solid',
				weight: 'thin',
				obstacle: false
			});
			// pallet truck outside the opening: backrest, body, steer wheel, tiller
			const bx = L;
			s.rect('forks', bx, forkBottom, DRAW.palletBackrestMm, sill + 300 - forkBottom, {
				fill: 'solid',
				weight: 'thin'
			});
			const wr = DRAW.palletWheelRadiusMm;
			s.rect('forks', bx + DRAW.palletBackrestMm, wr, DRAW.palletBodyLengthMm, sill + 80 - wr, {
				fill: 'tint',
				weight: 'normal'
			});
			s.circle('forks', bx + DRAW.palletBackrestMm + DRAW.palletBodyLengthMm / 2, wr, wr, {
				fill: 'solid'
			});
			const tx = bx + DRAW.palletBackrestMm + DRAW.palletBodyLengthMm * 0.7;
			s.line('forks', tx, sill + 80, tx + 150, sill + 520, { weight: 'heavy' });
			floorRight = Math.max(floorRight, tx + 150 + t);
			s.label(
				[['Pallet truck']],
				[
					{
						x: bx + DRAW.palletBackrestMm + DRAW.palletBodyLengthMm + t * 0.3,
						y: (wr + sill + 80) / 2,
						anchor: 'start',
						valign: 'middle'
					}
				],
				{
					role: 'forks',
					priority: 3
				}
			);

			// fork length and the allowed length, in rows under the floor
			s.dimension('horizontal', tip, L, rows[0], {
				role: 'forks',
				lines: [['Forks ', { mm: forkLen }]],
				extFrom: [forkBottom, forkBottom]
			});
			lowest = rows[0];
			if (trolleyKind === 'service') {
				const limit = fit.serviceTrolley.maxLengthMm;
				const over = forkLen - limit;
				s.dimension('horizontal', L - limit, L, rows[1], {
					role: 'frame',
					lines: [['Service trolley takes up to ', { mm: limit }]],
					extFrom: [plateTop - DRAW.plateMm, forkBottom]
				});
				lowest = rows[1];
				if (over > EPS)
					drawForkExcess(
						s,
						tip,
						L - limit,
						over,
						limit,
						forkLen,
						forkTone,
						rows[1],
						forkBottom,
						forkTop,
						forkMid,
						trolleyName,
						findings
					);
			} else {
				const { minLengthMm: min, maxLengthMm: max } = fit.latchTrolley;
				s.dimension('horizontal', L - max, L, rows[1], {
					role: 'frame',
					lines: [['Latch adapter fits up to ', { mm: max }]],
					extFrom: [plateTop - DRAW.plateMm, forkBottom]
				});
				s.dimension('horizontal', L - min, L, rows[2], {
					role: 'frame',
					lines: [['and at least ', { mm: min }]],
					extFrom: [forkBottom, forkBottom]
				});
				lowest = rows[2];
				if (forkLen - max > EPS) {
					drawForkExcess(
						s,
						tip,
						L - max,
						forkLen - max,
						max,
						forkLen,
						forkTone,
						rows[1],
						forkBottom,
						forkTop,
						forkMid,
						trolleyName,
						findings
					);
				} else if (min - forkLen > EPS) {
					const short = min - forkLen;
					const tone = forkTone === 'caution' ? 'caution' : 'clash';
					s.clashArea(L - min, forkBottom, short, forkTop - forkBottom, tone, true);
					s.dimension('horizontal', L - min, tip, rows[2], {
						role: 'clash',
						tone,
						lines: [[{ mm: short }, ' too short']],
						spots: [
							{ x: L - min - t * 0.3, y: rows[2], anchor: 'end', valign: 'middle' },
							{ x: L - min, y: rows[2] - t * 0.3, anchor: 'middle', valign: 'top' }
						]
					});
					findings.push({
						code: 'fork-length',
						tone,
						text: [
							`The pallet truck's `,
							{ mm: forkLen },
							` forks are `,
							{ mm: short },
							` shorter than the `,
							{ mm: min },
							` ${trolleyName} needs to latch; the missing part is outlined red.`
						]
					});
				}
			}
		} else {
			s.label(
				[['No pallet truck surveyed'], ['for ', trolleyName]],
				[{ x: L + t * 0.5, y: forkMid, anchor: 'start', valign: 'middle' }],
				{
					role: 'clash',
					tone: 'clash',
					bold: true,
					priority: 0
				}
			);
			findings.push({
				code: 'fork-length',
				tone: 'clash',
				text: [`The site has no pallet truck for ${trolleyName}.`]
			});
		}
	}

	// --- overhead hoist and lifting beam ---
	let hoistTop = top + DRAW.coverMm;
	if (hoist) {
		const crane = input.crane ?? null;
		const dashed = crane === null;
		const beamY = top + DRAW.coverMm + DRAW.hoistClearanceMm;
		const inset = Math.min(60, bl / 10);
		s.rect('hoist', inset, beamY, bl - 2 * inset, DRAW.beamDepthMm, {
			fill: dashed ? 'none' : 'solid',
			dashed,
			weight: 'thin'
		});
		for (const x of [inset * 2, bl - inset * 2])
			s.line('hoist', x, beamY, x, base + bh, { weight: 'normal', dashed });
		const hx = bl / 2;
		const hr = DRAW.hookRadiusMm;
		const hookY = beamY + DRAW.beamDepthMm + hr * 2.5;
		s.line('hoist', hx - bl * 0.12, beamY + DRAW.beamDepthMm, hx, hookY - hr, {
			weight: 'thin',
			dashed
		});
		s.line('hoist', hx + bl * 0.12, beamY + DRAW.beamDepthMm, hx, hookY - hr, {
			weight: 'thin',
			dashed
		});
		s.circle('hoist', hx, hookY, hr, { fill: 'none', weight: 'heavy', dashed });
		hoistTop = hookY + hr + 260;
		s.line('hoist', hx, hookY + hr, hx, hoistTop, { weight: 'heavy', dashed });
		s.label(
			[crane ? ['Overhead hoist and lifting beam'] : ['No overhead hoist surveyed']],
			[
				{ x: hx + t * 0.6, y: hookY + hr + t * 0.4, anchor: 'start', valign: 'bottom' },
				{
					x: bl - inset + t * 0.4,
					y: beamY + DRAW.beamDepthMm / 2,
					anchor: 'start',
					valign: 'middle'
				}
			],
			{
				role: crane ? 'hoist' : 'clash',
				tone: crane ? 'normal' : 'clash',
				bold: !crane,
				priority: crane ? 3 : 0
			}
		);
		if (!crane)
			findings.push({
				code: 'handling-capacity',
				tone: 'clash',
				text: ['The site has no overhead hoist to lift the battery.']
			});
	}

	// --- dimensions of the compartment ---
	// length across the top (above any battery poking out), chained with a length excess
	const topDimY = Math.max(top + DRAW.coverMm, base + bh) + t * 1.5;
	s.dimension('horizontal', 0, L, topDimY, {
		lines: [['Compartment ', { mm: L }]],
		extFrom: [top + DRAW.coverMm, top + DRAW.coverMm]
	});
	if (lengthOver > EPS) {
		const tone = toneOf(lengthCheck) === 'caution' ? 'caution' : 'clash';
		s.dimension('horizontal', L, bl, topDimY, {
			role: 'clash',
			tone,
			lines: [[{ mm: lengthOver }, ' too long']],
			extFrom: [base + bh, base + bh],
			spots: [
				{ x: bl + t * 0.4, y: topDimY, anchor: 'start', valign: 'middle' },
				{ x: (L + bl) / 2, y: topDimY + t * 0.3, anchor: 'middle', valign: 'bottom' }
			]
		});
	}
	if (playTone !== 'normal') {
		s.dimension('horizontal', bl, L, base + bh * 0.62, {
			role: 'gap',
			tone: playTone,
			lines: [
				['Play ', { mm: playLen }],
				['limit ', { mm: playLimit }]
			],
			spots: [
				{ x: bl - t * 0.4, y: base + t * 0.3, anchor: 'end', valign: 'bottom', inside: true },
				{ x: L + t * 1.5, y: base + bh * 0.62, anchor: 'start', valign: 'middle' },
				{
					x: L + t * 0.5,
					y: top + DRAW.coverMm + t * 0.2,
					anchor: 'start',
					valign: 'bottom',
					leaderTo: { x: L, y: base + bh * 0.62 }
				}
			],
			priority: 0
		});
	}
	// heights in a column left of the far frame, chained from the floor
	const colX = frameLeft - t * 1.2;
	if (rollerBed) {
		s.dimension('vertical', 0, bedTop, colX, {
			role: 'roller-bed',
			lines: [['Roller bed'], [{ mm: bedTop }]],
			extFrom: [-DRAW.wallMm, -DRAW.wallMm]
		});
		s.dimension('vertical', bedTop, usableTop, colX, {
			lines: [['Usable height'], [{ mm: usable }]],
			extFrom: [0, -DRAW.wallMm]
		});
	} else {
		s.dimension('vertical', sill, top, colX, {
			lines: [['Compartment'], ['height'], [{ mm: H }]],
			extFrom: [-DRAW.wallMm, -DRAW.wallMm]
		});
	}
	if (heightOver > EPS) {
		s.dimension('vertical', usableTop, base + bh, colX, {
			role: 'clash',
			tone: heightTone,
			lines: [[{ mm: heightOver }, ' too high']],
			spots: [
				{ x: colX - t * 0.4, y: base + bh + t * 0.2, anchor: 'end', valign: 'bottom' },
				{ x: colX - t * 0.4, y: base + bh + t * 1.6, anchor: 'end', valign: 'bottom' }
			],
			priority: 0
		});
	}

	// --- captions for the two ends ---
	const coverTop = top + DRAW.coverMm;
	s.label(
		[['Far frame']],
		[
			{ x: -DRAW.wallMm - t * 0.3, y: coverTop, anchor: 'end', valign: 'top' },
			{ x: -DRAW.wallMm - t * 0.3, y: coverTop + t * 0.2, anchor: 'end', valign: 'bottom' },
			{ x: t * 0.3, y: coverTop + t * 0.2, anchor: 'start', valign: 'bottom' }
		],
		{ role: 'frame', size: 'small', priority: 4, optional: true }
	);
	s.label(
		[['Side opening']],
		[
			{ x: L + t * 0.3, y: coverTop, anchor: 'start', valign: 'top' },
			{ x: L + t * 0.3, y: coverTop + t * 0.2, anchor: 'start', valign: 'bottom' },
			{ x: L - t * 0.3, y: coverTop + t * 0.2, anchor: 'end', valign: 'bottom' }
		],
		{ role: 'frame', size: 'small', priority: 4, optional: true }
	);

	s.placeLabels();

	// the floor spans the drawing; fix its width now everything is placed
	const pre = s.bbox([]);
	const floor = s.prims[0] as RectPrimitive;
	floor.x = Math.min(floorLeft, pre.minX);
	floor.width = Math.max(floorRight, standRight + t * 2, pre.maxX) - floor.x;
	s.prims.splice(1, 0, {
		type: 'line',
		role: 'floor',
		tone: 'normal',
		x1: floor.x,
		y1: 0,
		x2: floor.x + floor.width,
		y2: 0,
		weight: 'normal'
	});

	const scaleBar = { x: floor.x, y: lowest - t * 3.2 };
	const bb = s.bbox([
		{
			minX: scaleBar.x,
			maxX: scaleBar.x + 520 + t * 6,
			minY: scaleBar.y - t * 0.4,
			maxY: scaleBar.y + t * 1.2
		},
		{ minX: 0, maxX: 0, minY: 0, maxY: hoistTop }
	]);
	const m = t * 0.6;
	const bbox = { minX: bb.minX - m, minY: bb.minY - m, maxX: bb.maxX + m, maxY: bb.maxY + m };

	const trolleyWords =
		trolleyKind === 'service'
			? 'on its 2-roller service trolley'
			: trolleyKind === 'latch'
				? 'on its 4-roller latching trolley'
				: 'on the roller bed';
	const description: SceneText[] = [
		[
			`Side view across the truck, to scale, in the direction the battery leaves: the `,
			{ mm: L },
			` long, `,
			{ mm: H },
			` high compartment with the far frame on the left and the side opening on the right, and the `,
			{ mm: bl },
			` by `,
			{ mm: bh },
			` battery ${trolleyWords}.`
		]
	];
	if (rollerBed && input.stand)
		description.push([
			`The ${input.stand.kind === 'changer' ? 'battery changer' : 'roller stand'} waits alongside the opening with its rollers at `,
			{ mm: input.stand.rollerTopMm },
			`.`
		]);
	if (trolleyKind && forkLen !== null)
		description.push([
			`The pallet truck's `,
			{ mm: forkLen },
			` forks enter from the opening under the battery.`
		]);
	if (hoist && input.crane)
		description.push([`The overhead hoist's hook and lifting beam hang above the battery.`]);
	if (findings.length === 0) description.push(['Nothing clashes: every drawn part fits.']);
	for (const f of findings) description.push(f.text);

	return {
		setup,
		primitives: s.prims,
		bbox,
		textMm: t,
		title: [
			`${SETUP_TITLES[setup]}: compartment, battery and `,
			rollerBed ? 'stand rollers' : hoist ? 'forks and hoist' : 'forks',
			', to scale'
		],
		description,
		findings,
		legend: legendFor(s.prims, setup, input.stand?.kind),
		scaleBar
	};
}

function drawForkExcess(
	s: SceneBuilder,
	tip: number,
	stopX: number,
	over: number,
	limit: number,
	forkLen: number,
	forkTone: SceneTone,
	row: number,
	forkBottom: number,
	forkTop: number,
	forkMid: number,
	trolleyName: string,
	findings: SceneFinding[]
): void {
	const t = s.t;
	const tone = forkTone === 'caution' ? 'caution' : 'clash';
	const pad = t * 0.15;
	s.clashArea(tip, forkBottom - pad, over, forkTop - forkBottom + 2 * pad, tone);
	s.marker(stopX, forkMid, tone);
	s.dimension('horizontal', tip, stopX, row, {
		role: 'clash',
		tone,
		lines: [[{ mm: over }, ' too long']],
		extFrom: [forkBottom, forkBottom],
		spots: [
			{ x: tip - t * 0.4, y: row, anchor: 'end', valign: 'middle' },
			{ x: (tip + stopX) / 2, y: row - t * 0.3, anchor: 'middle', valign: 'top' },
			{ x: (tip + stopX) / 2, y: row + t * 0.3, anchor: 'middle', valign: 'bottom' }
		]
	});
	findings.push({
		code: 'fork-length',
		tone,
		text: [
			`The pallet truck's `,
			{ mm: forkLen },
			` forks are `,
			{ mm: over },
			` longer than the `,
			{ mm: limit },
			` ${trolleyName} takes; the excess, hatched red, runs into the far frame.`
		]
	});
}

/** A scale bar for the renderers: 500 mm in metric, 20 in (508 mm) in imperial, with its ticks. */
export function scaleBarFor(system: UnitSystem): {
	lengthMm: number;
	ticksMm: number[];
	label: string;
} {
	if (system === 'imperial') {
		return { lengthMm: 508, ticksMm: [0, 127, 254, 381, 508], label: '20 in' };
	}
	return { lengthMm: 500, ticksMm: [0, 100, 200, 300, 400, 500], label: '500 mm' };
}

function legendFor(
	prims: readonly ScenePrimitive[],
	setup: DrawingSetupId,
	standKind: 'stand' | 'changer' | undefined
): LegendEntry[] {
	const has = (role: SceneRole) =>
		prims.some(
			(p) => p.role === role && p.type !== 'label' && p.type !== 'dimension' && p.tone === 'normal'
		);
	const out: LegendEntry[] = [];
	out.push({ role: 'frame', tone: 'normal', label: 'Truck frame', swatch: 'fill' });
	out.push({ role: 'battery', tone: 'normal', label: 'Battery', swatch: 'fill' });
	if (has('roller-bed'))
		out.push({ role: 'roller-bed', tone: 'normal', label: 'Roller bed', swatch: 'circle' });
	if (has('stand'))
		out.push({
			role: 'stand',
			tone: 'normal',
			label: standKind === 'changer' ? 'Battery changer' : 'Roller stand',
			swatch: 'fill'
		});
	if (has('trolley'))
		out.push({
			role: 'trolley',
			tone: 'normal',
			label: setup === 'in-truck' ? '2-roller service trolley' : '4-roller latching trolley',
			swatch: 'fill'
		});
	if (has('forks'))
		out.push({ role: 'forks', tone: 'normal', label: 'Pallet truck and forks', swatch: 'fill' });
	if (has('hoist'))
		out.push({ role: 'hoist', tone: 'normal', label: 'Hoist and lifting beam', swatch: 'fill' });
	if (prims.some((p) => p.tone === 'clash'))
		out.push({ role: 'clash', tone: 'clash', label: 'Clash (hatched)', swatch: 'hatch' });
	if (prims.some((p) => p.tone === 'caution'))
		out.push({ role: 'gap', tone: 'caution', label: 'Needs attention (hatched)', swatch: 'hatch' });
	return out;
}
