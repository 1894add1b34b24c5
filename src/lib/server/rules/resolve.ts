/**
 * Resolves a request's `{ modelId }` references to specs with look-ups the caller provides (from
 * the database or a loaded catalogue), giving the engine's `ResolvedInput`.
 */

import type { UnitSystem } from '../../units';
import type {
	BatterySpec,
	FleetInput,
	OperationInput,
	ResolvedInput,
	SiteInput,
	TruckSpec
} from './types';

export interface ModelRef {
	modelId: string;
}

/** A request as the schema gives it: truck and battery as specs or catalogue references. */
export interface UnresolvedInput {
	truck: TruckSpec | ModelRef;
	battery: BatterySpec | ModelRef;
	fleet: FleetInput;
	operation: OperationInput;
	site: SiteInput;
	units?: UnitSystem;
}

export interface ModelLookup {
	truck(modelId: string): TruckSpec | null | undefined;
	battery(modelId: string): BatterySpec | null | undefined;
}

export type ResolveResult =
	{ ok: true; input: ResolvedInput } | { ok: false; errors: { path: string; message: string }[] };

export function isModelRef(x: unknown): x is ModelRef {
	return typeof x === 'object' && x !== null && typeof (x as ModelRef).modelId === 'string';
}

/** Replaces `{ modelId }` references; unknown ids become field errors (for a 400 answer). */
export function resolveInput(req: UnresolvedInput, lookup: ModelLookup): ResolveResult {
	const errors: { path: string; message: string }[] = [];
	let truck: TruckSpec | null = null;
	let battery: BatterySpec | null = null;
	if (isModelRef(req.truck)) {
		truck = lookup.truck(req.truck.modelId) ?? null;
		if (!truck)
			errors.push({
				path: 'truck.modelId',
				message: `No truck model “${req.truck.modelId}” in the catalogue.`
			});
	} else {
		truck = req.truck;
	}
	if (isModelRef(req.battery)) {
		battery = lookup.battery(req.battery.modelId) ?? null;
		if (!battery)
			errors.push({
				path: 'battery.modelId',
				message: `No battery “${req.battery.modelId}” in the catalogue.`
			});
	} else {
		battery = req.battery;
	}
	if (!truck || !battery) return { ok: false, errors };
	const input: ResolvedInput = {
		truck,
		battery,
		fleet: req.fleet,
		operation: req.operation,
		site: req.site
	};
	if (req.units) input.units = req.units;
	return { ok: true, input };
}
