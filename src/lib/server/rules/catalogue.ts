/**
 * Catalogue look-ups for the engine. A catalogue is indexed once (cached per catalogue object), so
 * evaluating many inputs against the same catalogue costs no indexing.
 */

import type {
	BatterySpec,
	ChargingMethod,
	Chemistry,
	EngineCatalogue,
	EquipmentItem,
	EquipmentKind,
	EquipmentSpecs,
	TruckSpec
} from './types';

export const EQUIPMENT_KINDS: readonly EquipmentKind[] = [
	'side-door',
	'wide-door',
	'side-cover',
	'service-trolley',
	'latch-trolley',
	'retrofit-kit',
	'roller-bed',
	'exchange-stand',
	'charging-stand',
	'roller-stand',
	'latch-adapter',
	'pallet-truck',
	'lifting-beam',
	'watering-kit',
	'charger',
	'battery'
];

const KIND_SET = new Set<string>(EQUIPMENT_KINDS);

/** Plain-language label of each kind, for BOM lines whose item the catalogue lacks. */
export const KIND_LABELS: Readonly<Record<EquipmentKind, string>> = {
	'side-door': 'Side battery door',
	'wide-door': 'Wide-swing battery door',
	'side-cover': 'Removable side cover',
	'service-trolley': '2-roller service trolley',
	'latch-trolley': 'Latching 4-roller trolley',
	'retrofit-kit': 'Service-to-latching trolley retrofit kit',
	'roller-bed': 'Compartment roller bed',
	'exchange-stand': 'Exchange stand',
	'charging-stand': 'Charging stand',
	'roller-stand': 'Roller stand',
	'latch-adapter': 'Latch adapter for pallet truck',
	'pallet-truck': 'Pallet truck',
	'lifting-beam': 'Lifting beam',
	'watering-kit': 'Battery watering kit',
	charger: 'Battery charger',
	battery: 'Battery'
};

export type ItemOf<K extends EquipmentKind> = Extract<EquipmentItem, { kind: K }>;

export interface PreparedCatalogue {
	byKind: { [K in EquipmentKind]: ItemOf<K>[] };
	bySku: Map<string, EquipmentItem>;
}

const cache = new WeakMap<EngineCatalogue, PreparedCatalogue>();

/** Indexes a catalogue by kind and SKU; the result is cached for the catalogue object. */
export function prepareCatalogue(catalogue: EngineCatalogue): PreparedCatalogue {
	const hit = cache.get(catalogue);
	if (hit) return hit;
	const byKind = {} as { [K in EquipmentKind]: EquipmentItem[] };
	for (const k of EQUIPMENT_KINDS) byKind[k] = [];
	const bySku = new Map<string, EquipmentItem>();
	for (const item of catalogue.items) {
		if (!item || !KIND_SET.has(item.kind)) continue;
		byKind[item.kind].push(item);
		if (!bySku.has(item.sku)) bySku.set(item.sku, item);
	}
	const prepared = { byKind, bySku } as PreparedCatalogue;
	cache.set(catalogue, prepared);
	return prepared;
}

export function firstOfKind<K extends EquipmentKind>(
	pc: PreparedCatalogue,
	kind: K
): ItemOf<K> | null {
	const list = pc.byKind[kind];
	return list.length > 0 ? list[0] : null;
}

/** The charger for a chemistry and charging method; else any charger for the chemistry. */
export function findCharger(
	pc: PreparedCatalogue,
	chemistry: Chemistry,
	method: ChargingMethod,
	voltage: number
): ItemOf<'charger'> | null {
	let fallback: ItemOf<'charger'> | null = null;
	for (const c of pc.byKind.charger) {
		if (c.spec.chemistry !== chemistry) continue;
		if (c.spec.voltage !== undefined && c.spec.voltage !== voltage) continue;
		if (c.spec.kind === method) return c;
		if (!fallback) fallback = c;
	}
	return fallback;
}

/** The catalogue battery matching a spec: by SKU first, else by voltage, capacity and chemistry. */
export function findBattery(pc: PreparedCatalogue, battery: BatterySpec): ItemOf<'battery'> | null {
	if (battery.sku) {
		const item = pc.bySku.get(battery.sku);
		if (item && item.kind === 'battery') return item;
	}
	for (const b of pc.byKind.battery) {
		if (
			b.spec.voltage === battery.voltage &&
			b.spec.capacityAh === battery.capacityAh &&
			b.spec.chemistry === battery.chemistry
		) {
			return b;
		}
	}
	return null;
}

// ---------------------------------------------------------------------------------------------
// Building a catalogue from plain rows (database rows or seed-data/catalogue.json)

export interface EquipmentRow {
	sku: string;
	kind: string;
	name: string;
	priceCents: number | string;
	spec?: unknown;
}

export interface BatteryRow {
	code: string;
	name: string;
	priceCents: number | string;
	spec: unknown;
}

/**
 * Builds the engine's catalogue from equipment rows and battery rows (battery code = SKU). Rows of
 * unknown kinds are skipped; bigint prices read as strings are converted. Keep the result and pass
 * the same object to every `evaluate` call: it is indexed once.
 */
export function buildEngineCatalogue(rows: {
	equipment: readonly EquipmentRow[];
	batteries?: readonly BatteryRow[];
}): EngineCatalogue {
	const items: EquipmentItem[] = [];
	for (const r of rows.equipment) {
		if (!KIND_SET.has(r.kind)) continue;
		items.push({
			sku: r.sku,
			kind: r.kind,
			name: r.name,
			priceCents: Number(r.priceCents) || 0,
			spec: (r.spec ?? {}) as EquipmentSpecs[EquipmentKind]
		} as EquipmentItem);
	}
	for (const b of rows.batteries ?? []) {
		items.push({
			sku: b.code,
			kind: 'battery',
			name: b.name,
			priceCents: Number(b.priceCents) || 0,
			spec: b.spec as EquipmentSpecs['battery']
		});
	}
	return { items };
}

/** The shape of seed-data/catalogue.json (also what the catalogue admin edits). */
export interface CatalogueFile {
	trucks: {
		code: string;
		name: string;
		family: string;
		capacityKg: number;
		priceCents?: number;
		costCents?: number;
		compatibleBatteries: string[];
		spec: TruckSpec;
	}[];
	batteries: {
		code: string;
		name: string;
		priceCents: number;
		costCents?: number;
		spec: Omit<BatterySpec, 'sku' | 'name'>;
	}[];
	equipment: (EquipmentRow & { costCents?: number })[];
}

/**
 * The engine catalogue plus model look-ups (by code) from a parsed catalogue file; for the demo,
 * tests and benchmarks. The app builds the same from database rows.
 */
export function fromCatalogueFile(file: CatalogueFile): {
	catalogue: EngineCatalogue;
	truck(code: string): TruckSpec | undefined;
	battery(code: string): BatterySpec | undefined;
} {
	const catalogue = buildEngineCatalogue({ equipment: file.equipment, batteries: file.batteries });
	const trucks = new Map<string, TruckSpec>();
	for (const t of file.trucks) trucks.set(t.code, { ...t.spec, code: t.code, name: t.name });
	const batteries = new Map<string, BatterySpec>();
	for (const b of file.batteries) batteries.set(b.code, { ...b.spec, sku: b.code, name: b.name });
	return { catalogue, truck: (c) => trucks.get(c), battery: (c) => batteries.get(c) };
}
