import { describe, expect, it } from 'vitest';
import type {
	BatterySpec,
	Check,
	SiteCrane,
	SitePalletTruck,
	SiteRollerStand,
	TruckSpec
} from '$lib/server/rules/types';
import {
	compartmentScene,
	labelLayout,
	primitiveBoxes,
	sceneText,
	type ClashPrimitive,
	type CompartmentScene,
	type CompartmentSceneInput,
	type DimensionPrimitive,
	type RectPrimitive
} from './compartment';

/** The truck, battery and site of shared/DESIGN.md §4, typed as the engine's own input types. */
const truck: TruckSpec = {
	voltage: 48,
	compartment: { lengthMm: 1050, widthMm: 860, heightMm: 640, heightWithRollerBedMm: 610 },
	rollerBedTopMm: 215,
	forkFit: {
		serviceTrolley: { maxLengthMm: 940, maxOverallWidthMm: 545 },
		latchTrolley: { minLengthMm: 1120, maxLengthMm: 1170, maxOverallWidthMm: 545 }
	},
	doorSwingDeg: 125,
	wideDoorSwingDeg: 180,
	batteryWeightKg: { min: 1000, max: 1450 }
};
const battery: BatterySpec = {
	voltage: 48,
	capacityAh: 775,
	lengthMm: 1000,
	widthMm: 820,
	heightMm: 580,
	weightKg: 1250,
	chemistry: 'lead-acid'
};
const palletTruck: SitePalletTruck = { forkLengthMm: 1150, overallWidthMm: 540, capacityKg: 2000 };
const stand: SiteRollerStand = {
	rollerTopMm: 215,
	adjustRangeMm: null,
	capacityKg: 1800,
	driveAlongside: true
};
const crane: SiteCrane = { ratedLoadKg: 2000, beamWeightKg: 90 };

function check(
	code: Check['code'],
	result: Check['result'],
	measured: number | null,
	limit: number | null,
	subject?: string
): Check {
	const c: Check = {
		code,
		result,
		measured,
		limit,
		unit: 'mm',
		message: '',
		remedy: null,
		fixable: true
	};
	if (subject) c.subject = subject;
	return c;
}

const rects = (s: CompartmentScene, role: string) =>
	s.primitives.filter((p): p is RectPrimitive => p.type === 'rect' && p.role === role);
const clashAreas = (s: CompartmentScene) =>
	s.primitives.filter((p): p is ClashPrimitive => p.type === 'clash' && p.shape === 'area');
const markers = (s: CompartmentScene) =>
	s.primitives.filter((p): p is ClashPrimitive => p.type === 'clash' && p.shape === 'marker');
const dims = (s: CompartmentScene) =>
	s.primitives.filter((p): p is DimensionPrimitive => p.type === 'dimension');

describe('compartmentScene: to scale', () => {
	it('draws the battery at its real length and height, on the roller tops for side transfer', () => {
		const s = compartmentScene({ truck, battery, setup: 'roller-bed', stand, checks: [] });
		const [b] = rects(s, 'battery');
		// DESIGN.md §4: battery 1 000 × 580 mm; roller tops 215 mm above the floor
		expect(b.width).toBe(1000);
		expect(b.height).toBe(580);
		expect(b.x).toBe(0);
		expect(b.y).toBe(215);
	});

	it('puts the compartment top where the usable height above the roller bed ends', () => {
		const s = compartmentScene({ truck, battery, setup: 'roller-bed', stand, checks: [] });
		const usable = dims(s).find(
			(d) => d.label && sceneText(d.label.lines[0], 'metric') === 'Usable height'
		);
		// 610 mm usable above 215 mm roller tops: 215 → 825
		expect(usable?.y1).toBe(215);
		expect(usable?.y2).toBe(825);
		expect(usable?.valueMm).toBe(610);
		const length = dims(s).find(
			(d) => d.label && sceneText(d.label.lines[0], 'metric').startsWith('Compartment')
		);
		expect(length?.x1).toBe(0);
		expect(length?.x2).toBe(1050);
	});

	it('draws the forks at their length from the side opening', () => {
		const s = compartmentScene({ truck, battery, setup: 'trolley-stand', palletTruck, checks: [] });
		const forks = rects(s, 'forks').find((r) => r.x + r.width === 1050 && r.width > 500);
		// DESIGN.md §4 pallet truck: 1 150 mm forks; the tip stands 1 050 − 1 150 = −100 mm, past the far wall
		expect(forks?.width).toBe(1150);
		expect(forks?.x).toBe(-100);
		expect(clashAreas(s)).toEqual([]);
	});

	it('the same input gives the same scene, and the input is left alone', () => {
		const input: CompartmentSceneInput = {
			truck,
			battery,
			setup: 'overhead-hoist',
			palletTruck,
			crane,
			checks: [check('fork-length', 'pass', 1150, 1170, 'pallet-truck')]
		};
		const before = JSON.stringify(input);
		const a = compartmentScene(input);
		const b = compartmentScene(input);
		expect(JSON.stringify(a)).toBe(JSON.stringify(b));
		expect(JSON.stringify(input)).toBe(before);
		expect(rects(a, 'hoist')).toHaveLength(1);
	});

	it('keeps every primitive inside the bounding box', () => {
		for (const setup of ['in-truck', 'roller-bed', 'trolley-stand', 'overhead-hoist'] as const) {
			const s = compartmentScene({ truck, battery, setup, palletTruck, stand, crane, checks: [] });
			for (const p of s.primitives) {
				for (const box of primitiveBoxes(p, s.textMm)) {
					expect(box.minX).toBeGreaterThanOrEqual(s.bbox.minX);
					expect(box.maxX).toBeLessThanOrEqual(s.bbox.maxX);
					expect(box.minY).toBeGreaterThanOrEqual(s.bbox.minY);
					expect(box.maxY).toBeLessThanOrEqual(s.bbox.maxY);
				}
			}
		}
	});
});

describe('compartmentScene: failed checks drawn in place', () => {
	it('hatches the part of the forks past the service trolley limit, with a marker at the far frame', () => {
		// 35.5 in service-trolley limit × 25.4 = 901.7 mm (common practice); 1 100 mm forks
		const limit = 35.5 * 25.4;
		const t: TruckSpec = {
			...truck,
			forkFit: { ...truck.forkFit, serviceTrolley: { maxLengthMm: limit, maxOverallWidthMm: 545 } }
		};
		const s = compartmentScene({
			truck: t,
			battery,
			setup: 'in-truck',
			palletTruck: { forkLengthMm: 1100 },
			checks: [check('fork-length', 'fail', 1100, limit, 'pallet-truck')]
		});
		const [clash] = clashAreas(s);
		// 1 100 − 901.7 = 198.3 mm, from the fork tip (1 050 − 1 100 = −50) to the limit (1 050 − 901.7 = 148.3)
		expect(clash.tone).toBe('clash');
		expect(clash.width).toBeCloseTo(198.3, 6);
		expect(clash.x).toBeCloseTo(-50, 6);
		const [marker] = markers(s);
		expect(marker.x).toBeCloseTo(148.3, 6);
		const excess = dims(s).find((d) => d.tone === 'clash');
		expect(excess?.valueMm).toBeCloseTo(198.3, 6);
		expect(sceneText(excess!.label!.lines[0], 'metric')).toBe('198 mm (7.8 in) too long');
		expect(s.findings.map((f) => f.code)).toContain('fork-length');
	});

	it('outlines the missing part when forks are too short for the latch adapter', () => {
		const s = compartmentScene({
			truck,
			battery,
			setup: 'trolley-stand',
			palletTruck: { forkLengthMm: 1000 },
			checks: [check('fork-length', 'fail', 1000, 1120, 'pallet-truck')]
		});
		const [missing] = clashAreas(s);
		// DESIGN.md §4 latch adapter: at least 1 120 mm; 1 120 − 1 000 = 120 mm missing
		expect(missing.dashed).toBe(true);
		expect(missing.width).toBeCloseTo(120, 6);
		expect(missing.x).toBeCloseTo(1050 - 1120, 6);
	});

	it('dimensions the step between the roller bed and stand rollers one inch off', () => {
		// 8 in roller bed = 203.2 mm, 9 in stand rollers = 228.6 mm (common practice): |203.2 − 228.6| = 25.4 mm
		const t: TruckSpec = { ...truck, rollerBedTopMm: 8 * 25.4 };
		const s = compartmentScene({
			truck: t,
			battery,
			setup: 'roller-bed',
			stand: { rollerTopMm: 9 * 25.4, adjustRangeMm: null },
			checks: [check('roller-height', 'fail', 228.6, 203.2, 'roller-stand')]
		});
		const step = dims(s).find((d) => d.role === 'gap');
		expect(step?.valueMm).toBeCloseTo(25.4, 6);
		expect(step?.y1).toBeCloseTo(203.2, 6);
		expect(step?.y2).toBeCloseTo(228.6, 6);
		expect(step?.tone).toBe('clash');
		expect(step?.arrows).toBe('outside');
		expect(sceneText(step!.label!.lines[0], 'imperial')).toBe('1.0 in (25 mm)');
		expect(s.findings.find((f) => f.code === 'roller-height')?.tone).toBe('clash');
	});

	it('marks the battery height above the usable height with a roller bed', () => {
		const tall = { ...battery, heightMm: 640 };
		const s = compartmentScene({
			truck,
			battery: tall,
			setup: 'roller-bed',
			stand,
			checks: [check('compartment-fit', 'fail', 640, 610, 'height')]
		});
		const [over] = clashAreas(s);
		// 640 − 610 = 30 mm over, from 215 + 610 = 825 mm up
		expect(over.height).toBeCloseTo(30, 6);
		expect(over.y).toBeCloseTo(825, 6);
		expect(over.width).toBe(1000);
	});

	it('marks a battery longer than the compartment past the side opening', () => {
		const long = { ...battery, lengthMm: 1080 };
		const s = compartmentScene({
			truck,
			battery: long,
			setup: 'roller-bed',
			stand,
			checks: [check('compartment-fit', 'fail', 1080, 1050, 'length')]
		});
		const [over] = clashAreas(s);
		expect(over.x).toBe(1050);
		expect(over.width).toBeCloseTo(30, 6);
	});

	it('marks horizontal play over 13 mm as a caution at the opening', () => {
		// 1 050 − 1 000 = 50 mm of play against 13 mm (½ in, common practice)
		const s = compartmentScene({
			truck,
			battery,
			setup: 'roller-bed',
			stand,
			checks: [check('compartment-fit', 'warn', 50, 13, 'play')]
		});
		const [gap] = clashAreas(s);
		expect(gap.tone).toBe('caution');
		expect(gap.x).toBe(1000);
		expect(gap.width).toBe(50);
		const dim = dims(s).find((d) => d.role === 'gap');
		expect(dim?.valueMm).toBe(50);
		expect(s.findings).toHaveLength(1);
	});

	it('does not mark play of 13 mm or less', () => {
		const snug = { ...battery, lengthMm: 1040 };
		const s = compartmentScene({
			truck,
			battery: snug,
			setup: 'roller-bed',
			stand,
			checks: [check('compartment-fit', 'pass', 10, 13, 'play')]
		});
		expect(clashAreas(s)).toEqual([]);
		expect(s.findings).toEqual([]);
		expect(sceneText(s.description[s.description.length - 1], 'metric')).toBe(
			'Nothing clashes: every drawn part fits.'
		);
	});

	it('describes a clash in words in either unit system', () => {
		const s = compartmentScene({
			truck,
			battery,
			setup: 'in-truck',
			palletTruck,
			checks: [check('fork-length', 'fail', 1150, 940, 'pallet-truck')]
		});
		const words = sceneText(s.findings[0].text, 'imperial');
		// 1 150 − 940 = 210 mm = 8.3 in
		expect(words).toContain('8.3 in (210 mm) longer than the 37.0 in (940 mm)');
		expect(s.legend.some((e) => e.swatch === 'hatch' && e.tone === 'clash')).toBe(true);
	});

	it('lays out label lines top-down from the label anchor', () => {
		const s = compartmentScene({ truck, battery, setup: 'roller-bed', stand, checks: [] });
		const label = s.primitives.find(
			(p) => p.type === 'label' && sceneText(p.lines[0], 'metric') === 'Battery'
		);
		expect(label?.type).toBe('label');
		if (label?.type !== 'label') return;
		const layout = labelLayout(label, s.textMm);
		expect(layout.baselines).toHaveLength(3);
		expect(layout.baselines[0]).toBeLessThan(label.y);
		expect(layout.baselines[1]).toBeLessThan(layout.baselines[0]);
	});
});
