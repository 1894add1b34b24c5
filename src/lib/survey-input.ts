import type { SurveyData } from './schemas/survey';

/**
 * Turns a (possibly half-filled) survey into the body of `POST /api/v1/evaluate`.
 * Shared by the browser's live panel and the server's recommendation screen, so both ask the
 * engine exactly the same question. Returns what is still missing when it cannot.
 */
export type EvaluateBody = {
	truck: { modelId: string };
	battery:
		| { modelId: string }
		| {
				voltage: number;
				capacityAh: number;
				lengthMm: number;
				widthMm: number;
				heightMm: number;
				weightKg: number;
				chemistry: 'lead-acid' | 'lithium-ion';
		  };
	fleet: { trucks: number };
	operation: {
		shiftsPerDay: number;
		hoursPerShift: number;
		daysPerWeek: number;
		energyKwhPerHour: number;
		charging: 'conventional' | 'opportunity' | 'fast';
	};
	site: {
		palletTrucks: { forkLengthMm: number; overallWidthMm: number; capacityKg: number }[];
		rollerStands: {
			rollerTopMm: number;
			adjustRangeMm: { minMm: number; maxMm: number } | null;
			capacityKg: number;
			driveAlongside: boolean;
			kind: 'stand' | 'changer';
		}[];
		crane: { ratedLoadKg: number; beamWeightKg: number | null } | null;
		chargingArea: { floorAreaM2: number; ventilationM3h: number; eyewash: boolean; neutraliser: boolean } | null;
	};
};

export type BuildResult = { ok: true; body: EvaluateBody } | { ok: false; missing: string[] };

const num = (v: unknown): v is number => typeof v === 'number' && Number.isFinite(v) && v > 0;

export function buildEvaluateBody(data: SurveyData): BuildResult {
	const missing: string[] = [];
	const f = data.fleet ?? {};
	const o = data.operation ?? {};
	const e = data.equipment ?? {};
	const c = data.charging ?? {};

	if (!f.truckModelId) missing.push('truck model');
	if (!num(f.trucks)) missing.push('number of trucks');
	let battery: EvaluateBody['battery'] | null = null;
	if (f.batterySource === 'measured') {
		const m = f.measured;
		if (
			m &&
			num(m.voltage) &&
			num(m.capacityAh) &&
			num(m.lengthMm) &&
			num(m.widthMm) &&
			num(m.heightMm) &&
			num(m.weightKg) &&
			(m.chemistry === 'lead-acid' || m.chemistry === 'lithium-ion')
		) {
			battery = {
				voltage: m.voltage,
				capacityAh: m.capacityAh,
				lengthMm: m.lengthMm,
				widthMm: m.widthMm,
				heightMm: m.heightMm,
				weightKg: m.weightKg,
				chemistry: m.chemistry
			};
		} else missing.push('measured battery');
	} else if (f.batteryId) battery = { modelId: f.batteryId };
	else missing.push('battery');

	if (!num(o.shiftsPerDay)) missing.push('shifts a day');
	if (!num(o.hoursPerShift)) missing.push('hours per shift');
	if (!num(o.daysPerWeek)) missing.push('days a week');
	if (!num(o.energyKwhPerHour)) missing.push('energy per hour');
	if (!o.charging) missing.push('charging method');

	const palletTrucks = (e.palletTrucks ?? []).filter(
		(p): p is { forkLengthMm: number; overallWidthMm: number; capacityKg: number } =>
			!!p && num(p.forkLengthMm) && num(p.overallWidthMm) && num(p.capacityKg)
	);
	const rollerStands: EvaluateBody['site']['rollerStands'] = [];
	for (const s of e.rollerStands ?? []) {
		if (!s || !num(s.rollerTopMm) || !num(s.capacityKg)) continue;
		const range = s.adjustable && num(s.adjustMinMm) && num(s.adjustMaxMm) ? { minMm: s.adjustMinMm, maxMm: s.adjustMaxMm } : null;
		rollerStands.push({
			rollerTopMm: s.rollerTopMm,
			adjustRangeMm: range,
			capacityKg: s.capacityKg,
			driveAlongside: !!s.driveAlongside,
			kind: s.kind === 'changer' ? 'changer' : 'stand'
		});
	}
	const crane =
		e.hasCrane && num(e.craneRatedLoadKg)
			? { ratedLoadKg: e.craneRatedLoadKg, beamWeightKg: e.hasBeam && num(e.beamWeightKg) ? e.beamWeightKg : null }
			: null;
	const chargingArea =
		c.hasArea !== false && num(c.floorAreaM2) && typeof c.ventilationM3h === 'number' && c.ventilationM3h >= 0
			? { floorAreaM2: c.floorAreaM2, ventilationM3h: c.ventilationM3h, eyewash: !!c.eyewash, neutraliser: !!c.neutraliser }
			: null;

	if (missing.length || !battery) return { ok: false, missing };
	return {
		ok: true,
		body: {
			truck: { modelId: f.truckModelId! },
			battery,
			fleet: { trucks: f.trucks! },
			operation: {
				shiftsPerDay: o.shiftsPerDay!,
				hoursPerShift: o.hoursPerShift!,
				daysPerWeek: o.daysPerWeek!,
				energyKwhPerHour: o.energyKwhPerHour!,
				charging: o.charging!
			},
			site: { palletTrucks, rollerStands, crane, chargingArea }
		}
	};
}
