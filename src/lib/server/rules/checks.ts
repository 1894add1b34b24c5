/**
 * The compatibility checks (codes are public API, shared/DESIGN.md §3). Each check states the
 * measured value, the limit and its unit, a plain sentence with the numbers, and a remedy when one
 * exists. `fixable` says whether an order from the catalogue or a change at the site resolves a
 * failure; an unfixable failure makes the setup `does-not-fit`.
 */

import { firstOfKind, KIND_LABELS, type ItemOf } from './catalogue';
import { count, num, type Ctx } from './context';
import type {
	Check,
	CheckCode,
	CheckResult,
	SitePalletTruck,
	SiteRollerStand,
	Verdict
} from './types';

export function makeCheck(
	code: CheckCode,
	result: CheckResult,
	measured: number | null,
	limit: number | null,
	unit: string,
	message: string,
	remedy: string | null,
	fixable: boolean,
	subject?: string
): Check {
	const c: Check = { code, result, measured, limit, unit, message, remedy, fixable };
	if (subject !== undefined) c.subject = subject;
	return c;
}

/** fits / fits-with-changes / does-not-fit from a setup's checks (issue 3 verdict rules). */
export function verdictOf(checks: readonly Check[]): Verdict {
	let changes = false;
	for (const c of checks) {
		if (c.result !== 'fail') continue;
		if (!c.fixable) return 'does-not-fit';
		changes = true;
	}
	return changes ? 'fits-with-changes' : 'fits';
}

// ---------------------------------------------------------------------------------------------
// Battery against truck

export function voltageCheck(ctx: Ctx): Check {
	const b = ctx.battery.voltage;
	const t = ctx.truck.voltage;
	if (Math.abs(b - t) <= ctx.eps) {
		return makeCheck(
			'voltage',
			'pass',
			b,
			t,
			'V',
			`The ${num(b)} V battery matches the truck's ${num(t)} V system.`,
			null,
			true
		);
	}
	return makeCheck(
		'voltage',
		'fail',
		b,
		t,
		'V',
		`The battery is ${num(b)} V but the truck runs on ${num(t)} V.`,
		`Choose a ${num(t)} V battery.`,
		false
	);
}

export function weightCheck(ctx: Ctx): Check {
	const w = ctx.battery.weightKg;
	const { min, max } = ctx.truck.batteryWeightKg;
	if (w + ctx.eps < min) {
		return makeCheck(
			'battery-weight',
			'fail',
			w,
			min,
			'kg',
			`The battery weighs ${ctx.M(w)}, below the truck's minimum of ${ctx.M(min)}; the battery is part of the counterweight, so a lighter one leaves the truck less stable than its rating assumes.`,
			`Choose a battery of at least ${ctx.M(min)}, ballasted if need be.`,
			false
		);
	}
	if (w > max + ctx.eps) {
		return makeCheck(
			'battery-weight',
			'fail',
			w,
			max,
			'kg',
			`The battery weighs ${ctx.M(w)}, above the truck's maximum of ${ctx.M(max)}.`,
			`Choose a battery of at most ${ctx.M(max)}.`,
			false
		);
	}
	return makeCheck(
		'battery-weight',
		'pass',
		w,
		max,
		'kg',
		`The battery weighs ${ctx.M(w)}, within the truck's window of ${ctx.M(min)} to ${ctx.M(max)}.`,
		null,
		true
	);
}

/**
 * Length, width and height against the compartment (the roller bed lowers the usable height), and
 * horizontal play beyond `maxHorizontalPlayMm` that spacers must take up.
 */
export function compartmentChecks(ctx: Ctx, withRollerBed: boolean): Check[] {
	const c = ctx.truck.compartment;
	const b = ctx.battery;
	const eps = ctx.eps;
	const out: Check[] = [];
	const lengthOk = b.lengthMm <= c.lengthMm + eps;
	const widthOk = b.widthMm <= c.widthMm + eps;
	out.push(
		lengthOk
			? makeCheck(
					'compartment-fit',
					'pass',
					b.lengthMm,
					c.lengthMm,
					'mm',
					`The battery's length of ${ctx.L(b.lengthMm)} fits the compartment's ${ctx.L(c.lengthMm)}.`,
					null,
					true,
					'length'
				)
			: makeCheck(
					'compartment-fit',
					'fail',
					b.lengthMm,
					c.lengthMm,
					'mm',
					`The battery is ${ctx.L(b.lengthMm)} long but the compartment takes ${ctx.L(c.lengthMm)}.`,
					`Choose a shorter battery from the truck's compatible list.`,
					false,
					'length'
				)
	);
	out.push(
		widthOk
			? makeCheck(
					'compartment-fit',
					'pass',
					b.widthMm,
					c.widthMm,
					'mm',
					`The battery's width of ${ctx.L(b.widthMm)} fits the compartment's ${ctx.L(c.widthMm)}.`,
					null,
					true,
					'width'
				)
			: makeCheck(
					'compartment-fit',
					'fail',
					b.widthMm,
					c.widthMm,
					'mm',
					`The battery is ${ctx.L(b.widthMm)} wide but the compartment takes ${ctx.L(c.widthMm)}.`,
					`Choose a narrower battery from the truck's compatible list.`,
					false,
					'width'
				)
	);
	const h = withRollerBed ? c.heightWithRollerBedMm : c.heightMm;
	if (b.heightMm <= h + eps) {
		out.push(
			makeCheck(
				'compartment-fit',
				'pass',
				b.heightMm,
				h,
				'mm',
				`The battery's height of ${ctx.L(b.heightMm)} fits the ${ctx.L(h)} available${withRollerBed ? ' above the roller bed' : ''}.`,
				null,
				true,
				'height'
			)
		);
	} else if (withRollerBed && b.heightMm <= c.heightMm + eps) {
		out.push(
			makeCheck(
				'compartment-fit',
				'fail',
				b.heightMm,
				h,
				'mm',
				`The battery is ${ctx.L(b.heightMm)} high; the roller bed lowers the compartment's usable height to ${ctx.L(h)} (${ctx.L(c.heightMm)} without it).`,
				`Choose a battery no higher than ${ctx.L(h)}, or a setup without the roller bed.`,
				false,
				'height'
			)
		);
	} else {
		out.push(
			makeCheck(
				'compartment-fit',
				'fail',
				b.heightMm,
				h,
				'mm',
				`The battery is ${ctx.L(b.heightMm)} high but the compartment takes ${ctx.L(h)}${withRollerBed ? ' with the roller bed' : ''}.`,
				`Choose a battery no higher than ${ctx.L(h)}.`,
				false,
				'height'
			)
		);
	}
	if (lengthOk && widthOk) {
		const dl = c.lengthMm - b.lengthMm;
		const dw = c.widthMm - b.widthMm;
		const play = Math.max(dl, dw);
		const axis = dl >= dw ? 'length' : 'width';
		const max = ctx.p.maxHorizontalPlayMm;
		out.push(
			play > max + eps
				? makeCheck(
						'compartment-fit',
						'warn',
						play,
						max,
						'mm',
						`The battery leaves ${ctx.L(play)} of play along the compartment's ${axis}; more than ${ctx.L(max)} must be taken up with spacers so the battery cannot shift.`,
						`Fit spacers to bring the play to ${ctx.L(max)} or less.`,
						true,
						'play'
					)
				: makeCheck(
						'compartment-fit',
						'pass',
						play,
						max,
						'mm',
						`The battery sits with at most ${ctx.L(play)} of play, within ${ctx.L(max)}.`,
						null,
						true,
						'play'
					)
		);
	}
	return out;
}

// ---------------------------------------------------------------------------------------------
// Pallet truck against the truck's fork fit

export type TrolleyKind = 'service' | 'latch';

export interface PalletTruckAssessment {
	checks: Check[];
	/** catalogue pallet truck to order, one per exchange point; null when the site's fits */
	order: ItemOf<'pallet-truck'> | null;
	/** the site's pallet truck is used as it is */
	siteFits: boolean;
	/** battery plus trolley, kg */
	loadKg: number;
}

interface ForkLimits {
	trolley: TrolleyKind;
	svcMax: number;
	latchMin: number;
	latchMax: number;
	maxW: number;
	loadKg: number;
	eps: number;
}

function forkLengthOk(l: ForkLimits, len: number): boolean {
	return l.trolley === 'service'
		? len <= l.svcMax + l.eps
		: len + l.eps >= l.latchMin && len <= l.latchMax + l.eps;
}

function forkWidthOk(l: ForkLimits, w: number): boolean {
	return w <= l.maxW + l.eps;
}

function capacityOk(l: ForkLimits, kg: number): boolean {
	return kg + l.eps >= l.loadKg;
}

function palletTruckOk(l: ForkLimits, pt: SitePalletTruck): boolean {
	return (
		forkLengthOk(l, pt.forkLengthMm) &&
		forkWidthOk(l, pt.overallWidthMm) &&
		capacityOk(l, pt.capacityKg)
	);
}

export function palletTruckAssessment(ctx: Ctx, trolley: TrolleyKind): PalletTruckAssessment {
	const eps = ctx.eps;
	const fit = ctx.truck.forkFit;
	const svc = fit.serviceTrolley;
	const latch = fit.latchTrolley;
	const maxW = trolley === 'service' ? svc.maxOverallWidthMm : latch.maxOverallWidthMm;
	const trolleyItem = firstOfKind(
		ctx.pc,
		trolley === 'service' ? 'service-trolley' : 'latch-trolley'
	);
	const loadKg = ctx.battery.weightKg + (trolleyItem?.spec.weightKg ?? 0);
	const lim: ForkLimits = {
		trolley,
		svcMax: svc.maxLengthMm,
		latchMin: latch.minLengthMm,
		latchMax: latch.maxLengthMm,
		maxW,
		loadKg,
		eps
	};

	const site = ctx.site.palletTrucks;
	let chosen: SitePalletTruck | null = null;
	for (const pt of site)
		if (palletTruckOk(lim, pt)) {
			chosen = pt;
			break;
		}
	if (!chosen)
		for (const pt of site)
			if (forkLengthOk(lim, pt.forkLengthMm) && forkWidthOk(lim, pt.overallWidthMm)) {
				chosen = pt;
				break;
			}
	if (!chosen)
		for (const pt of site)
			if (forkLengthOk(lim, pt.forkLengthMm)) {
				chosen = pt;
				break;
			}
	if (!chosen && site.length > 0) chosen = site[0];

	const siteFits = chosen !== null && palletTruckOk(lim, chosen);
	let order: ItemOf<'pallet-truck'> | null = null;
	if (!siteFits) {
		for (const item of ctx.pc.byKind['pallet-truck']) {
			if (palletTruckOk(lim, item.spec)) {
				order = item;
				break;
			}
		}
	}
	const trolleyName =
		trolley === 'service' ? 'the 2-roller service trolley' : 'the latching trolley';
	const lengthText =
		trolley === 'service'
			? `at most ${ctx.L(svc.maxLengthMm)} long`
			: `${ctx.L(latch.minLengthMm)} to ${ctx.L(latch.maxLengthMm)} long`;
	const orderText = order
		? `Use a pallet truck with forks ${lengthText}, at most ${ctx.L(maxW)} over the forks and rated for ${ctx.M(loadKg)}: order ${order.sku} (${order.name}).`
		: null;
	const fixable = order !== null;
	const checks: Check[] = [];

	if (!chosen) {
		checks.push(
			makeCheck(
				'fork-length',
				'fail',
				null,
				trolley === 'service' ? svc.maxLengthMm : latch.maxLengthMm,
				'mm',
				`The site has no pallet truck; ${trolleyName} needs one with forks ${lengthText} and at most ${ctx.L(maxW)} over the forks.`,
				orderText,
				fixable,
				'pallet-truck'
			)
		);
		return { checks, order, siteFits: false, loadKg };
	}

	const len = chosen.forkLengthMm;
	if (trolley === 'service') {
		checks.push(
			forkLengthOk(lim, len)
				? makeCheck(
						'fork-length',
						'pass',
						len,
						svc.maxLengthMm,
						'mm',
						`The pallet truck's ${ctx.L(len)} forks stay short of the far side of the frame: the service trolley takes forks up to ${ctx.L(svc.maxLengthMm)}.`,
						null,
						true,
						'pallet-truck'
					)
				: makeCheck(
						'fork-length',
						'fail',
						len,
						svc.maxLengthMm,
						'mm',
						`The pallet truck's ${ctx.L(len)} forks are longer than the ${ctx.L(svc.maxLengthMm)} the service trolley takes; they would hit the far side of the frame.`,
						orderText ?? `Use a pallet truck with forks ${lengthText}.`,
						fixable,
						'pallet-truck'
					)
		);
	} else {
		const limit = len + eps < latch.minLengthMm ? latch.minLengthMm : latch.maxLengthMm;
		checks.push(
			forkLengthOk(lim, len)
				? makeCheck(
						'fork-length',
						'pass',
						len,
						limit,
						'mm',
						`The pallet truck's ${ctx.L(len)} forks are within the ${ctx.L(latch.minLengthMm)} to ${ctx.L(latch.maxLengthMm)} the latch adapter fits.`,
						null,
						true,
						'pallet-truck'
					)
				: makeCheck(
						'fork-length',
						'fail',
						len,
						limit,
						'mm',
						`The pallet truck's ${ctx.L(len)} forks are ${len < limit ? 'shorter' : 'longer'} than the ${ctx.L(latch.minLengthMm)} to ${ctx.L(latch.maxLengthMm)} the latch adapter fits.`,
						orderText ?? `Use a pallet truck with forks ${lengthText}.`,
						fixable,
						'pallet-truck'
					)
		);
	}
	const w = chosen.overallWidthMm;
	checks.push(
		forkWidthOk(lim, w)
			? makeCheck(
					'fork-width',
					'pass',
					w,
					maxW,
					'mm',
					`The forks measure ${ctx.L(w)} over the outside, within the ${ctx.L(maxW)} ${trolleyName} allows.`,
					null,
					true,
					'pallet-truck'
				)
			: makeCheck(
					'fork-width',
					'fail',
					w,
					maxW,
					'mm',
					`The forks measure ${ctx.L(w)} over the outside; ${trolleyName} allows ${ctx.L(maxW)}, so they cannot enter.`,
					orderText ?? `Use a pallet truck at most ${ctx.L(maxW)} over the forks.`,
					fixable,
					'pallet-truck'
				)
	);
	const cap = chosen.capacityKg;
	checks.push(
		capacityOk(lim, cap)
			? makeCheck(
					'handling-capacity',
					'pass',
					cap,
					loadKg,
					'kg',
					`The pallet truck is rated ${ctx.M(cap)}, enough for the ${ctx.M(loadKg)} of battery and trolley.`,
					null,
					true,
					'pallet-truck'
				)
			: makeCheck(
					'handling-capacity',
					'fail',
					cap,
					loadKg,
					'kg',
					`The pallet truck is rated ${ctx.M(cap)}, less than the ${ctx.M(loadKg)} of battery and trolley.`,
					orderText ?? `Use a pallet truck rated for at least ${ctx.M(loadKg)}.`,
					fixable,
					'pallet-truck'
				)
	);
	return { checks, order, siteFits, loadKg };
}

// ---------------------------------------------------------------------------------------------
// Roller stands or changer against the roller bed; door swing

export interface StandAssessment {
	checks: Check[];
	/** catalogue roller stand to order; null when the site's fit */
	order: ItemOf<'roller-stand'> | null;
	/** door or side cover to order for each truck; null when not needed */
	doorOrder: ItemOf<'wide-door'> | ItemOf<'side-cover'> | null;
	/** the site's own stands or changer meet the roller bed and carry the battery */
	siteMatches: boolean;
}

interface StandLike {
	rollerTopMm: number;
	adjustRangeMm: { minMm: number; maxMm: number } | null;
	capacityKg: number;
	driveAlongside: boolean;
	kind?: 'stand' | 'changer';
}

function standWord(s: StandLike | null): string {
	return s?.kind === 'changer' ? 'battery changer' : 'roller stands';
}

interface StandLimits {
	bed: number;
	tol: number;
	load: number;
	eps: number;
}

function standMeets(l: StandLimits, s: StandLike): boolean {
	return s.adjustRangeMm
		? s.adjustRangeMm.minMm <= l.bed + l.eps && l.bed <= s.adjustRangeMm.maxMm + l.eps
		: Math.abs(s.rollerTopMm - l.bed) <= l.tol + l.eps;
}

function standCarries(l: StandLimits, s: StandLike): boolean {
	return s.capacityKg + l.eps >= l.load;
}

export function standAssessment(ctx: Ctx, standsNeeded: number): StandAssessment {
	const eps = ctx.eps;
	const bed = ctx.truck.rollerBedTopMm;
	const tol = ctx.p.rollerHeightToleranceMm;
	const load = ctx.battery.weightKg;
	const sl: StandLimits = { bed, tol, load, eps };
	const site: readonly SiteRollerStand[] = ctx.site.rollerStands;
	let chosen: SiteRollerStand | null = null;
	for (const s of site)
		if (standMeets(sl, s) && standCarries(sl, s)) {
			chosen = s;
			break;
		}
	if (!chosen)
		for (const s of site)
			if (standMeets(sl, s)) {
				chosen = s;
				break;
			}
	if (!chosen && site.length > 0) chosen = site[0];
	const siteMatches = chosen !== null && standMeets(sl, chosen) && standCarries(sl, chosen);

	let order: ItemOf<'roller-stand'> | null = null;
	if (!siteMatches) {
		for (const item of ctx.pc.byKind['roller-stand']) {
			if (standMeets(sl, item.spec) && standCarries(sl, item.spec)) {
				order = item;
				break;
			}
		}
	}
	const orderText = order
		? `Order ${standsNeeded} × ${order.sku} (${order.name})${order.spec.adjustRangeMm ? `, whose rollers set anywhere from ${ctx.L(order.spec.adjustRangeMm.minMm)} to ${ctx.L(order.spec.adjustRangeMm.maxMm)}` : ''}.`
		: null;
	const fixable = order !== null;
	const checks: Check[] = [];

	if (!chosen) {
		checks.push(
			makeCheck(
				'roller-height',
				'fail',
				null,
				bed,
				'mm',
				`The site has no roller stands or changer; side transfer needs rollers that meet the roller bed at ${ctx.L(bed)}.`,
				orderText,
				fixable,
				'roller-stand'
			)
		);
	} else {
		const word = standWord(chosen);
		if (chosen.adjustRangeMm) {
			const r = chosen.adjustRangeMm;
			const reach = Math.min(Math.max(bed, r.minMm), r.maxMm);
			checks.push(
				standMeets(sl, chosen)
					? makeCheck(
							'roller-height',
							'pass',
							reach,
							bed,
							'mm',
							`The site's ${word} adjust from ${ctx.L(r.minMm)} to ${ctx.L(r.maxMm)}, which spans the roller bed's ${ctx.L(bed)}.`,
							null,
							true,
							'roller-stand'
						)
					: makeCheck(
							'roller-height',
							'fail',
							reach,
							bed,
							'mm',
							`The site's ${word} adjust from ${ctx.L(r.minMm)} to ${ctx.L(r.maxMm)}, which does not reach the roller bed's ${ctx.L(bed)}.`,
							orderText ?? `Use stands whose rollers can be set to ${ctx.L(bed)}.`,
							fixable,
							'roller-stand'
						)
			);
		} else {
			const top = chosen.rollerTopMm;
			const gap = Math.abs(top - bed);
			checks.push(
				standMeets(sl, chosen)
					? makeCheck(
							'roller-height',
							'pass',
							top,
							bed,
							'mm',
							`The site's ${word} have rollers at ${ctx.L(top)}, within ${ctx.L(tol)} of the roller bed's ${ctx.L(bed)}.`,
							null,
							true,
							'roller-stand'
						)
					: makeCheck(
							'roller-height',
							'fail',
							top,
							bed,
							'mm',
							`The site's fixed ${word} have rollers at ${ctx.L(top)}, ${ctx.L(gap)} ${top > bed ? 'above' : 'below'} the roller bed's ${ctx.L(bed)}; the tolerance is ${ctx.L(tol)}.`,
							orderText ?? `Use stands whose rollers can be set to ${ctx.L(bed)}.`,
							fixable,
							'roller-stand'
						)
			);
		}
	}

	// Capacity: of the site's stands when they meet the roller bed, else of the ones to order.
	const rated: StandLike | null =
		chosen && standMeets(sl, chosen) ? chosen : (order?.spec ?? chosen);
	if (rated) {
		const who =
			rated === chosen ? `The site's ${standWord(rated)}` : `The ordered ${standWord(rated)}`;
		checks.push(
			standCarries(sl, rated)
				? makeCheck(
						'handling-capacity',
						'pass',
						rated.capacityKg,
						load,
						'kg',
						`${who} are rated ${ctx.M(rated.capacityKg)}, enough for the ${ctx.M(load)} battery.`,
						null,
						true,
						'roller-stand'
					)
				: makeCheck(
						'handling-capacity',
						'fail',
						rated.capacityKg,
						load,
						'kg',
						`${who} are rated ${ctx.M(rated.capacityKg)}, less than the ${ctx.M(load)} battery.`,
						orderText ?? `Use stands rated for at least ${ctx.M(load)}.`,
						fixable,
						'roller-stand'
					)
		);
	}
	// Door swing: for the stands actually used.
	const used: StandLike | null = siteMatches ? chosen : (order?.spec ?? chosen);
	const door = ctx.truck.doorSwingDeg;
	const need = ctx.p.minDoorSwingAlongsideDeg;
	let doorOrder: StandAssessment['doorOrder'] = null;
	if (!used) {
		// nothing to transfer onto: the roller-height check already fails
	} else if (!used.driveAlongside) {
		checks.push(
			makeCheck(
				'door-swing',
				'pass',
				door,
				null,
				'deg',
				`The ${standWord(used)} do not drive alongside the truck, so the standard ${num(door)}° door is enough.`,
				null,
				true
			)
		);
	} else if (door + ctx.eps >= need) {
		checks.push(
			makeCheck(
				'door-swing',
				'pass',
				door,
				need,
				'deg',
				`The ${num(door)}° door folds clear of gear that drives alongside the truck (${num(need)}° needed).`,
				null,
				true
			)
		);
	} else {
		const wideItem = firstOfKind(ctx.pc, 'wide-door');
		const cover = firstOfKind(ctx.pc, 'side-cover');
		const wideOk = wideItem !== null && ctx.truck.wideDoorSwingDeg + ctx.eps >= need;
		doorOrder = wideOk ? wideItem : cover;
		let remedy: string | null = null;
		if (wideOk && wideItem) {
			remedy = `Order the wide-swing door (${num(ctx.truck.wideDoorSwingDeg)}°, ${wideItem.sku}) for each truck${cover ? `, or the removable side cover (${cover.sku})` : ''}.`;
		} else if (cover) {
			remedy = `Order the removable side cover (${cover.sku}) for each truck${wideItem ? `; the wide-swing door opens only ${num(ctx.truck.wideDoorSwingDeg)}°` : ''}.`;
		}
		checks.push(
			makeCheck(
				'door-swing',
				'fail',
				door,
				need,
				'deg',
				`The standard door opens ${num(door)}°; ${used.kind === 'changer' ? 'a changer' : 'gear'} that drives alongside the truck needs a door that opens at least ${num(need)}° or no door at all.`,
				remedy,
				doorOrder !== null
			)
		);
	}
	return { checks, order, doorOrder, siteMatches };
}

// ---------------------------------------------------------------------------------------------
// Overhead hoist and lifting beam

export interface HoistAssessment {
	checks: Check[];
	beamOrder: ItemOf<'lifting-beam'> | null;
	/** the site's hoist carries battery plus beam */
	hoistPasses: boolean;
}

export function hoistAssessment(ctx: Ctx): HoistAssessment {
	const eps = ctx.eps;
	const w = ctx.battery.weightKg;
	const crane = ctx.site.crane;
	const checks: Check[] = [];
	let beamOrder: ItemOf<'lifting-beam'> | null = null;
	let beamKg = 0;
	const siteBeam = crane?.beamWeightKg;
	if (siteBeam !== undefined && siteBeam !== null && siteBeam > 0) {
		beamKg = siteBeam;
	} else if (crane) {
		for (const b of ctx.pc.byKind['lifting-beam']) {
			if (b.spec.ratedLoadKg + eps >= w) {
				beamOrder = b;
				break;
			}
		}
		beamKg = beamOrder?.spec.weightKg ?? 0;
		{
			checks.push(
				beamOrder
					? makeCheck(
							'handling-capacity',
							'fail',
							null,
							w,
							'kg',
							`The site has no lifting beam; the hoist needs one rated for the ${ctx.M(w)} battery to lift it with a vertical pull.`,
							`Order the ${beamOrder.name} (${beamOrder.sku}), rated ${ctx.M(beamOrder.spec.ratedLoadKg)}, weighing ${ctx.M(beamOrder.spec.weightKg)}.`,
							true,
							'lifting-beam'
						)
					: makeCheck(
							'handling-capacity',
							'fail',
							null,
							w,
							'kg',
							`The site has no lifting beam and the catalogue has none rated for the ${ctx.M(w)} battery.`,
							null,
							false,
							'lifting-beam'
						)
			);
		}
	}
	const total = w + beamKg;
	let hoistPasses = false;
	if (!crane) {
		checks.push(
			makeCheck(
				'handling-capacity',
				'fail',
				null,
				total,
				'kg',
				`The site has no overhead hoist; hoist exchange needs one rated for at least ${ctx.M(total)}, battery and lifting beam together.`,
				null,
				false,
				'hoist'
			)
		);
	} else if (crane.ratedLoadKg + eps >= total) {
		hoistPasses = true;
		checks.push(
			makeCheck(
				'handling-capacity',
				'pass',
				crane.ratedLoadKg,
				total,
				'kg',
				`The overhead hoist is rated ${ctx.M(crane.ratedLoadKg)}, enough for the ${ctx.M(w)} battery plus the ${ctx.M(beamKg)} lifting beam, ${ctx.M(total)} in all.`,
				null,
				true,
				'hoist'
			)
		);
	} else {
		checks.push(
			makeCheck(
				'handling-capacity',
				'fail',
				crane.ratedLoadKg,
				total,
				'kg',
				`The overhead hoist is rated ${ctx.M(crane.ratedLoadKg)}, less than the ${ctx.M(total)} of battery and lifting beam; everything below the hook counts against the rating.`,
				`A hoist rated for at least ${ctx.M(total)} is needed; that is building work, not a catalogue order.`,
				false,
				'hoist'
			)
		);
	}
	return { checks, beamOrder, hoistPasses };
}

/** A catalogue stand (exchange or charging) against the load it carries. */
export function catalogueStandCheck(
	ctx: Ctx,
	item: ItemOf<'exchange-stand'> | ItemOf<'charging-stand'> | null,
	loadKg: number,
	what: string
): Check | null {
	if (!item) return null;
	const cap = item.spec.capacityKg;
	const label = KIND_LABELS[item.kind].toLowerCase();
	return cap + ctx.eps >= loadKg
		? makeCheck(
				'handling-capacity',
				'pass',
				cap,
				loadKg,
				'kg',
				`The ${label} ${item.sku} is rated ${ctx.M(cap)}, enough for the ${ctx.M(loadKg)} of ${what}.`,
				null,
				true,
				item.kind
			)
		: makeCheck(
				'handling-capacity',
				'fail',
				cap,
				loadKg,
				'kg',
				`The ${label} ${item.sku} is rated ${ctx.M(cap)}, less than the ${ctx.M(loadKg)} of ${what}; the catalogue has no stronger one.`,
				null,
				false,
				item.kind
			);
}

// ---------------------------------------------------------------------------------------------
// Floor space, ventilation, duty

/** Floor for one stand with its battery, margins and half the shared aisle, m². */
export function floorPerStandM2(ctx: Ctx): number {
	const m = ctx.p.standMarginMm;
	const l = ctx.battery.lengthMm + 2 * m;
	const w = ctx.battery.widthMm + 2 * m;
	return (l * w + (l * ctx.p.aisleWidthMm) / 2) / 1e6;
}

export function floorCheck(ctx: Ctx, stands: number): Check {
	const need = stands * floorPerStandM2(ctx);
	const area = ctx.site.chargingArea;
	const what = `${count(stands, 'stand', 'stands')} need about ${ctx.A(need)} of floor with their share of the aisle`;
	if (!area) {
		return makeCheck(
			'floor-space',
			'warn',
			need,
			null,
			'm2',
			`No charging area was surveyed; the ${what}.`,
			'Survey the charging area and its floor area.',
			true
		);
	}
	return need <= area.floorAreaM2 + ctx.eps
		? makeCheck(
				'floor-space',
				'pass',
				need,
				area.floorAreaM2,
				'm2',
				`The ${what}; the charging area offers ${ctx.A(area.floorAreaM2)}.`,
				null,
				true
			)
		: makeCheck(
				'floor-space',
				'fail',
				need,
				area.floorAreaM2,
				'm2',
				`The ${what}, more than the ${ctx.A(area.floorAreaM2)} the charging area offers.`,
				`Offer at least ${ctx.A(need)} of floor for the stands, e.g. a larger or a second charging area.`,
				true
			);
}

export function ventilationCheck(ctx: Ctx, requiredM3h: number, chargingAtOnce: number): Check {
	const area = ctx.site.chargingArea;
	const who = `${count(chargingAtOnce, 'battery', 'batteries')} charging at once`;
	if (ctx.battery.chemistry !== 'lead-acid') {
		return makeCheck(
			'ventilation',
			'pass',
			area ? area.ventilationM3h : null,
			0,
			'm3/h',
			`Lithium-ion batteries give off no gas in normal charging; ventilate the charging area as the battery maker asks.`,
			null,
			true
		);
	}
	if (!area) {
		return makeCheck(
			'ventilation',
			'warn',
			null,
			requiredM3h,
			'm3/h',
			`No charging area was surveyed; the ${who} need ${ctx.F(requiredM3h)} of air flow.`,
			`Survey the charging area's ventilation.`,
			true
		);
	}
	const have = area.ventilationM3h;
	return have + ctx.eps >= requiredM3h
		? makeCheck(
				'ventilation',
				'pass',
				have,
				requiredM3h,
				'm3/h',
				`The charging area's ${ctx.F(have)} covers the ${ctx.F(requiredM3h)} the ${who} need.`,
				null,
				true
			)
		: makeCheck(
				'ventilation',
				'fail',
				have,
				requiredM3h,
				'm3/h',
				`The charging area's ${ctx.F(have)} falls short of the ${ctx.F(requiredM3h)} the ${who} need.`,
				`Raise the charging area's ventilation to at least ${ctx.F(requiredM3h)}, or charge fewer batteries at once.`,
				true
			);
}

/** For `in-truck`: does one battery per truck cover the day under the charging method? */
export function dutyCheck(ctx: Ctx): Check {
	const d = ctx.duty;
	const ebu = num(d.ebu);
	const energy = `The day's ${num(d.hoursPerDay)} h of work draw ${num(d.dailyEnergyKwh, 1)} kWh; one battery gives ${num(d.usableEnergyKwh, 2)} kWh usable (EBU ${ebu})`;
	if (d.oneBatteryEbuLimit !== null) {
		const method = d.charging === 'opportunity' ? 'opportunity charging' : 'fast charging';
		const chem = ctx.battery.chemistry === 'lithium-ion' ? 'lithium-ion' : 'lead-acid';
		if (d.oneBatteryCovers) {
			return makeCheck(
				'duty',
				'pass',
				round2(d.ebu),
				d.oneBatteryEbuLimit,
				'EBU',
				`${energy}; ${method} carries one ${chem} battery up to EBU ${num(d.oneBatteryEbuLimit)}.`,
				null,
				true
			);
		}
		return makeCheck(
			'duty',
			'fail',
			round2(d.ebu),
			d.oneBatteryEbuLimit,
			'EBU',
			`${energy}, beyond the EBU ${num(d.oneBatteryEbuLimit)} that ${method} carries on one ${chem} battery; the fleet falls back to battery exchange with ${count(d.batteriesPerTruck, 'battery', 'batteries')} per truck.`,
			chem === 'lead-acid'
				? 'Choose an exchange setup, a larger battery, or lithium-ion.'
				: 'Choose an exchange setup or a larger battery.',
			false
		);
	}
	const rest = `${num(d.chargeHours)} h on charge${d.coolHours > 0 ? ` and ${num(d.coolHours)} h cooling` : ''}`;
	if (d.oneBatteryCovers) {
		return makeCheck(
			'duty',
			'pass',
			1,
			1,
			'batteries per truck',
			`${energy}; with ${rest} between work periods, one battery per truck covers the day.`,
			null,
			true
		);
	}
	return makeCheck(
		'duty',
		'fail',
		d.batteriesPerTruck,
		1,
		'batteries per truck',
		`${energy}; with ${rest} before a battery is used again, the day needs ${count(d.batteriesPerTruck, 'battery', 'batteries')} per truck, so one battery kept in the truck cannot cover it.`,
		'Choose an exchange setup, or opportunity or fast charging if the EBU allows.',
		false
	);
}

function round2(x: number): number {
	return Math.round(x * 100) / 100;
}
