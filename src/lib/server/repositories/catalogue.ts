import { Op } from 'sequelize';
import { Battery, Equipment, TruckModel, TruckModelBattery } from '../db/models';
import { buildEngineCatalogue } from '../rules/catalogue';
import type { BatterySpec, EngineCatalogue, TruckSpec } from '../rules/types';

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

export interface TruckModelRow {
	id: string;
	code: string;
	name: string;
	family: string;
	capacityKg: number;
	priceCents: number;
	costCents: number;
	retired: boolean;
	spec: TruckSpec;
	batteryIds: string[];
}

export interface BatteryRow {
	id: string;
	code: string;
	name: string;
	priceCents: number;
	costCents: number;
	retired: boolean;
	spec: BatterySpec;
}

export interface EquipmentRow {
	id: string;
	sku: string;
	kind: string;
	name: string;
	priceCents: number;
	costCents: number;
	retired: boolean;
	spec: Record<string, unknown>;
}

function truckRow(t: TruckModel, batteryIds: string[]): TruckModelRow {
	return {
		id: t.id,
		code: t.code,
		name: t.name,
		family: t.family,
		capacityKg: t.capacityKg,
		priceCents: t.priceCents,
		costCents: t.costCents,
		retired: t.retired,
		spec: { ...(t.spec as unknown as TruckSpec), code: t.code, name: t.name },
		batteryIds
	};
}

function batteryRow(b: Battery): BatteryRow {
	return {
		id: b.id,
		code: b.code,
		name: b.name,
		priceCents: b.priceCents,
		costCents: b.costCents,
		retired: b.retired,
		spec: { ...(b.spec as unknown as BatterySpec), sku: b.code, name: b.name }
	};
}

function equipmentRow(e: Equipment): EquipmentRow {
	return {
		id: e.id,
		sku: e.sku,
		kind: e.kind,
		name: e.name,
		priceCents: e.priceCents,
		costCents: e.costCents,
		retired: e.retired,
		spec: e.spec
	};
}

/** Truck models with their compatible battery ids; retired ones only when asked. */
export async function listTruckModels(opts: { includeRetired?: boolean } = {}): Promise<TruckModelRow[]> {
	const [trucks, links] = await Promise.all([
		TruckModel.findAll({
			where: opts.includeRetired ? {} : { retired: false },
			order: [['family', 'ASC'], ['capacityKg', 'ASC']]
		}),
		TruckModelBattery.findAll()
	]);
	return trucks.map((t) =>
		truckRow(
			t,
			links.filter((l) => l.truckModelId === t.id).map((l) => l.batteryId)
		)
	);
}

export async function listBatteries(opts: { includeRetired?: boolean } = {}): Promise<BatteryRow[]> {
	const rows = await Battery.findAll({
		where: opts.includeRetired ? {} : { retired: false },
		order: [['code', 'ASC']]
	});
	return rows.map(batteryRow);
}

export async function listEquipment(opts: { includeRetired?: boolean } = {}): Promise<EquipmentRow[]> {
	const rows = await Equipment.findAll({
		where: opts.includeRetired ? {} : { retired: false },
		order: [['kind', 'ASC'], ['priceCents', 'ASC']]
	});
	return rows.map(equipmentRow);
}

/** A truck model by id or code (retired models still resolve: old surveys refer to them). */
export async function findTruckModel(ref: string): Promise<TruckModelRow | null> {
	const t = await TruckModel.findOne({ where: UUID.test(ref) ? { id: ref } : { code: ref } });
	if (!t) return null;
	const links = await TruckModelBattery.findAll({ where: { truckModelId: t.id } });
	return truckRow(
		t,
		links.map((l) => l.batteryId)
	);
}

export async function findBattery(ref: string): Promise<BatteryRow | null> {
	const b = await Battery.findOne({ where: UUID.test(ref) ? { id: ref } : { code: ref } });
	return b ? batteryRow(b) : null;
}

let cached: { at: number; catalogue: EngineCatalogue } | null = null;
/** seconds a process keeps the engine catalogue; admin edits in this process clear it at once */
const CATALOGUE_TTL_MS = 30_000;

/**
 * The engine's catalogue: active equipment (cheapest first within a kind) and batteries as items
 * of kind 'battery'. Cached briefly per process: every evaluation reads it.
 */
export async function engineCatalogue(): Promise<EngineCatalogue> {
	if (cached && Date.now() - cached.at < CATALOGUE_TTL_MS) return cached.catalogue;
	const [equipment, batteries] = await Promise.all([listEquipment(), listBatteries()]);
	const catalogue = buildEngineCatalogue({
		equipment,
		batteries: batteries.map((b) => ({ code: b.code, name: b.name, priceCents: b.priceCents, spec: b.spec }))
	} as Parameters<typeof buildEngineCatalogue>[0]);
	cached = { at: Date.now(), catalogue };
	return cached.catalogue;
}

export function clearCatalogueCache(): void {
	cached = null;
}

/** Truck models and batteries by many ids at once (one query each). */
export async function trucksByIds(ids: string[]): Promise<TruckModelRow[]> {
	if (ids.length === 0) return [];
	const rows = await TruckModel.findAll({ where: { id: { [Op.in]: ids } } });
	return rows.map((t) => truckRow(t, []));
}
