/**
 * Safety cautions: the battery-handling items of OSHA 29 CFR 1910.178(g) that apply to the site, in
 * our own words, the eyewash figures of ANSI/ISEA Z358.1, and always, last, the note that local
 * codes, the truck's nameplate and licensed practice govern.
 */

import type { Ctx } from './context';

/** The closing note every list of cautions ends with. */
export const GOVERNING_NOTE =
	"Local codes, the truck's nameplate and licensed practice govern battery handling and charging; these notes summarise common requirements and do not replace them.";

export function cautionsFor(ctx: Ctx): string[] {
	const leadAcid = ctx.battery.chemistry === 'lead-acid';
	const area = ctx.site.chargingArea;
	const out: string[] = [];
	out.push('Charge batteries only in the designated charging area. (OSHA 1910.178(g)(1))');
	if (leadAcid) {
		out.push(
			'Keep the means to flush away and neutralise spilled electrolyte at the charging area, provide fire protection, guard chargers against damage from trucks, and ventilate to carry off the gases of charging. (OSHA 1910.178(g)(2))'
		);
	} else {
		out.push(
			'Provide fire protection suited to lithium-ion batteries at the charging area and guard chargers against damage from trucks. (OSHA 1910.178(g)(2))'
		);
	}
	out.push(
		`Move batteries with a conveyor, an overhead hoist or equivalent gear rated for the load: this battery alone weighs ${ctx.M(ctx.battery.weightKg)}. (OSHA 1910.178(g)(4))`
	);
	out.push(
		`When a battery goes back in, position it properly and secure it; take up horizontal play over ${ctx.L(ctx.p.maxHorizontalPlayMm)} with spacers. (OSHA 1910.178(g)(5))`
	);
	if (leadAcid) {
		out.push('Handle electrolyte with a carboy tilter or a siphon. (OSHA 1910.178(g)(6))');
		out.push(
			'When mixing electrolyte, pour acid into water, never water into acid. (OSHA 1910.178(g)(7))'
		);
	}
	out.push(
		'Position the truck and set its brake before changing or charging a battery. (OSHA 1910.178(g)(8))'
	);
	if (leadAcid) {
		out.push(
			'Keep vent caps working and open the battery or compartment cover while charging so the battery can cool. (OSHA 1910.178(g)(9))'
		);
	}
	out.push('No smoking in the charging area. (OSHA 1910.178(g)(10))');
	out.push(
		'Keep open flames, sparks and electric arcs away from the charging area; keep at least 0.5 m (20 in) clear of them around a battery on charge. (OSHA 1910.178(g)(11); DGUV Information 209-067)'
	);
	out.push('Keep tools and other metal off the top of uncovered batteries. (OSHA 1910.178(g)(12))');
	if (ctx.site.crane) {
		out.push(
			'Lift with an insulated lifting beam whose hooks line up with the lifting eyes for a vertical pull, and cover the terminals with a non-conducting sheet; the hoist must be rated for battery plus beam. (NFPA 505; ASME B30.20)'
		);
	}
	if (leadAcid) {
		const missing: string[] = [];
		if (!area || area.eyewash !== true) missing.push('an eyewash');
		if (!area || area.neutraliser !== true) missing.push('neutralising supplies');
		out.push(
			`Provide an eyewash reachable within 10 seconds that flushes for 15 minutes at 1.5 L/min (0.4 gal/min) or more. (ANSI/ISEA Z358.1)${missing.length ? ` The survey did not record ${missing.join(' or ')} at this site.` : ''}`
		);
	}
	out.push(GOVERNING_NOTE);
	return out;
}
