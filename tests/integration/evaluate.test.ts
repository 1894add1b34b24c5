import { describe, expect, it } from 'vitest';
import { BASE, DEMO, client, signIn } from '../helpers/http';
import { chosenSurvey } from '../helpers/scenario';

// The request of the product design's API example (DESIGN.md §4), which the demo catalogue's
// truck TW-B4-25 and battery TW-B48-775-LA reproduce as catalogue models.
const example = {
	truck: {
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
	},
	battery: { voltage: 48, capacityAh: 775, lengthMm: 1000, widthMm: 820, heightMm: 580, weightKg: 1250, chemistry: 'lead-acid' },
	fleet: { trucks: 6 },
	operation: { shiftsPerDay: 3, hoursPerShift: 8, daysPerWeek: 5, energyKwhPerHour: 3.5, charging: 'conventional' },
	site: {
		palletTrucks: [{ forkLengthMm: 1150, overallWidthMm: 540, capacityKg: 2000 }],
		rollerStands: [{ rollerTopMm: 215, adjustRangeMm: null, capacityKg: 1800, driveAlongside: true }],
		crane: { ratedLoadKg: 2000, beamWeightKg: 90 },
		chargingArea: { floorAreaM2: 40, ventilationM3h: 150 }
	}
};

describe('POST /api/v1/evaluate', () => {
	it('answers 401 JSON to a signed-out caller, never a redirect', async () => {
		const res = await client().post('/api/v1/evaluate', example);
		expect(res.status).toBe(401);
		expect(res.headers.get('content-type')).toContain('application/json');
	});

	it('answers the design example with all four setups, checks with numbers, quantities, cost, ventilation and cautions', async () => {
		const rep = await signIn(DEMO.rep);
		const res = await rep.post('/api/v1/evaluate', example);
		expect(res.status).toBe(200);
		const body = await res.json();
		// the design's example answer
		expect(body.recommended).toBe('overhead-hoist');
		expect(body.batteriesPerTruck).toBe(3); // three 8-hour shifts, conventional charging → 3 ("8-8-8", common practice)
		expect(body.changesPerTruckPerDay).toBe(2);
		// EBU = 24 h × 3.5 kWh/h ÷ (48 V × 775 Ah × 0.8 / 1000) = 84 ÷ 29.76 = 2.82 (arithmetic)
		expect(body.ebu).toBeCloseTo(2.82, 2);
		expect(body.setups.map((s: { id: string }) => s.id).sort()).toEqual(['in-truck', 'overhead-hoist', 'roller-bed', 'trolley-stand']);
		const inTruck = body.setups.find((s: { id: string }) => s.id === 'in-truck');
		const fork = inTruck.checks.find((c: { code: string }) => c.code === 'fork-length');
		expect(fork).toMatchObject({ result: 'fail', measured: 1150, limit: 940, unit: 'mm' });
		expect(fork.message).toMatch(/1.?150/);
		for (const s of body.setups) {
			expect(['fits', 'fits-with-changes', 'does-not-fit']).toContain(s.verdict);
			expect(s.reasons.length).toBeGreaterThan(0);
			expect(s.costOverYears.years).toBe(5);
			for (const c of s.checks) expect(typeof c.message).toBe('string');
		}
		const hoist = body.setups.find((s: { id: string }) => s.id === 'overhead-hoist');
		expect(hoist.rank).toBe(1);
		// 6 trucks × (3 − 1) extra batteries
		expect(hoist.fleet.extraBatteries).toBe(12);
		// EN IEC 62485-3:2014 §6.2.2: 24 cells, 775 Ah, IU (f = 2) → 0.055 × 24 × 15.5 = 20.46 m³/h per battery
		expect(body.ventilation.perBatteryM3h).toBeCloseTo(20.46, 2);
		expect(body.cautions.at(-1)).toMatch(/local codes/i);
	});

	it('accepts catalogue references by model code or id', async () => {
		const rep = await signIn(DEMO.rep);
		const res = await rep.post('/api/v1/evaluate', { ...example, truck: { modelId: 'TW-B4-25' }, battery: { modelId: 'TW-B48-775-LA' } });
		expect(res.status).toBe(200);
		const body = await res.json();
		expect(body.recommended).toBe('overhead-hoist');
		const unknown = await rep.post('/api/v1/evaluate', { ...example, truck: { modelId: 'NO-SUCH' } });
		expect(unknown.status).toBe(400);
		expect((await unknown.json()).errors['truck.modelId']).toBeDefined();
	});

	it('answers 400 with an error per bad field path', async () => {
		const rep = await signIn(DEMO.rep);
		const bad = structuredClone(example) as Record<string, any>;
		bad.fleet.trucks = 0;
		bad.operation.charging = 'sometimes';
		bad.site.palletTrucks[0].forkLengthMm = -5;
		const res = await rep.post('/api/v1/evaluate', bad);
		expect(res.status).toBe(400);
		const body = await res.json();
		expect(Object.keys(body.errors)).toEqual(
			expect.arrayContaining(['fleet.trucks', 'operation.charging', 'site.palletTrucks.0.forkLengthMm'])
		);
		const notJson = await rep.post('/api/v1/evaluate', '{"truck":');
		expect(notJson.status).toBe(400);
		const notObject = await rep.post('/api/v1/evaluate', '[1,2,3]');
		expect(notObject.status).toBe(400);
	});

	it('answers 413 to a body over 64 KB', async () => {
		const rep = await signIn(DEMO.rep);
		const res = await rep.post('/api/v1/evaluate', JSON.stringify({ ...example, padding: 'x'.repeat(70 * 1024) }));
		expect(res.status).toBe(413);
	});

	it('is reachable only by POST', async () => {
		const res = await fetch(`${BASE}/api/v1/evaluate`);
		expect(res.status).toBe(405);
	});
});

describe('the recommendation page speaks the user’s units', () => {
	it('gives the engine’s figures in inches first to a rep who works in imperial units, in millimetres first to one who works in metric', async () => {
		// rep2 works in imperial units (seed-data/people.json); a survey of their own team
		const imperial = await signIn(DEMO.rep2);
		const metric = await signIn(DEMO.rep);
		const mine = await chosenSurvey(metric);
		const theirs = await chosenSurvey(imperial);
		const metricHtml = await (await metric.get(`/surveys/${mine}/recommendation`)).text();
		const imperialHtml = await (await imperial.get(`/surveys/${theirs}/recommendation`)).text();
		// e.g. "1 150 mm (45.3 in)" for metric and "45.3 in (1 150 mm)" for imperial, in the check sentences
		expect(metricHtml).toMatch(/\d mm \(\d+(\.\d)? in\)/);
		expect(metricHtml).not.toMatch(/\d in \(\d[\d ]* mm\)/);
		expect(imperialHtml).toMatch(/\d in \(\d[\d ]* mm\)/);
		expect(imperialHtml).not.toMatch(/\d mm \(\d+(\.\d)? in\)/);
	});
});
