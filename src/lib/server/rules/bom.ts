/**
 * Bill of materials lines and the cost over years. Lines name catalogue SKUs; an item the catalogue
 * lacks is listed with a null SKU at price 0 ("price on request") so the count is never lost.
 */

import { findBattery, firstOfKind, KIND_LABELS } from './catalogue';
import type { Ctx } from './context';
import { batteryEnergyKwh } from './fleet';
import type { BomLine, CostOverYears, EquipmentItem, EquipmentKind } from './types';

export class Bom {
	readonly lines: BomLine[] = [];
	constructor(private readonly ctx: Ctx) {}

	/** Adds `quantity` of `item` (or the catalogue's first of `kind`); nothing when quantity ≤ 0. */
	add(kind: EquipmentKind, quantity: number, reason: string, item?: EquipmentItem | null): void {
		if (!(quantity > 0)) return;
		const it = item ?? firstOfKind(this.ctx.pc, kind);
		const unit = it ? it.priceCents : 0;
		this.lines.push({
			sku: it ? it.sku : null,
			kind,
			description: it ? it.name : `${KIND_LABELS[kind]} (not in the catalogue; price on request)`,
			quantity,
			reason,
			unitPriceCents: unit,
			lineTotalCents: unit * quantity
		});
	}

	/** Extra batteries: the catalogue's matching battery, else priced per kWh (RuleParams). */
	addBatteries(quantity: number, reason: string): void {
		if (!(quantity > 0)) return;
		const b = this.ctx.battery;
		const item = findBattery(this.ctx.pc, b);
		if (item) {
			this.add('battery', quantity, reason, item);
			return;
		}
		const kwh = batteryEnergyKwh(b.voltage, b.capacityAh);
		const unit = Math.round(kwh * this.ctx.p.batteryPriceCentsPerKwh[b.chemistry]);
		this.lines.push({
			sku: null,
			kind: 'battery',
			description: `${b.name ?? `${+b.voltage.toFixed(1)} V ${+b.capacityAh.toFixed(1)} Ah ${b.chemistry} battery`} (not in the catalogue; estimated per kWh)`,
			quantity,
			reason,
			unitPriceCents: unit,
			lineTotalCents: unit * quantity
		});
	}

	/** Watering kits, one per lead-acid battery (lithium-ion needs no watering). */
	addWatering(batteries: number): void {
		if (this.ctx.battery.chemistry !== 'lead-acid') return;
		this.add('watering-kit', batteries, 'One per lead-acid battery: tops up every cell at once.');
	}
}

/** Labour hours a year for battery changes: trucks × changes a day × minutes ÷ 60 × working days. */
export function labourHoursPerYear(
	ctx: Ctx,
	changesPerTruckPerDay: number,
	minutesPerChange: number
): number {
	return (ctx.trucks * changesPerTruckPerDay * minutesPerChange * ctx.workingDaysPerYear) / 60;
}

/** Cost over the comparison years: equipment and extra batteries at list price, plus labour. */
export function costOverYears(
	ctx: Ctx,
	lines: readonly BomLine[],
	labourHours: number
): CostOverYears {
	let equipment = 0;
	let batteries = 0;
	for (const l of lines) {
		if (l.kind === 'battery') batteries += l.lineTotalCents;
		else equipment += l.lineTotalCents;
	}
	const labour = Math.round(labourHours * ctx.labourRatePerHourCents * ctx.years);
	return {
		years: ctx.years,
		equipment,
		labour,
		batteries,
		total: equipment + labour + batteries,
		currency: 'USD'
	};
}
