import type { BatteryRow } from '$lib/server/repositories/catalogue';

/** Batteries as the truck form's compatibility list shows them. */
export function batteryOptions(rows: BatteryRow[]) {
	return rows.map((b) => ({
		id: b.id,
		code: b.code,
		name: b.name,
		retired: b.retired,
		voltage: b.spec.voltage,
		capacityAh: b.spec.capacityAh,
		weightKg: b.spec.weightKg,
		chemistry: b.spec.chemistry
	}));
}
