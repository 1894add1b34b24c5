import { Op, col, fn, literal, where as sqlWhere, type Transaction, type WhereOptions } from 'sequelize';
import { sequelize } from '../db';
import { Battery, Equipment, TruckModel, TruckModelBattery } from '../db/models';
import type { BatteryInput, EquipmentInput, TruckModelInput } from '../../schemas/catalogue';
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
	// one statement: each model with its compatible battery ids (every survey page reads this)
	const trucks = await TruckModel.findAll({
		where: opts.includeRetired ? {} : { retired: false },
		order: [['family', 'ASC'], ['capacityKg', 'ASC']],
		attributes: {
			include: [
				[
					literal(
						`ARRAY(SELECT l.battery_id FROM truck_model_batteries l WHERE l.truck_model_id = "TruckModel"."id")`
					),
					'batteryIds'
				]
			]
		}
	});
	return trucks.map((t) => truckRow(t, (t.get('batteryIds') as string[] | null) ?? []));
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

// ---------------------------------------------------------------------------------------------
// Catalogue administration: create, update, retire, restore and delete. Every write runs in one
// transaction (a truck model with its compatibility links) and clears the engine's cached
// catalogue once it has committed.

/** What a save came to: the stored row, or why nothing was stored. */
export type CatalogueSaveOutcome<T> =
	| { ok: true; row: T }
	| { ok: false; reason: 'not-found' }
	| { ok: false; reason: 'duplicate'; code: string }
	| { ok: false; reason: 'unknown-batteries' }
	| { ok: false; reason: 'battery-voltage'; codes: string[] };

/** What a delete came to; `in-use` when surveys refer to the entry (retire it instead). */
export type CatalogueDeleteOutcome =
	| { ok: true; code: string }
	| { ok: false; reason: 'not-found' }
	| { ok: false; reason: 'in-use'; surveys: number };

function isUniqueViolation(err: unknown): boolean {
	return (err as { name?: string })?.name === 'SequelizeUniqueConstraintError';
}

/** Another row of `model` already has this code (compared without case), other than `exceptId`. */
async function codeTaken(
	model: typeof TruckModel | typeof Battery | typeof Equipment,
	column: 'code' | 'sku',
	code: string,
	exceptId: string | null,
	transaction: Transaction
): Promise<boolean> {
	const conditions: WhereOptions[] = [sqlWhere(fn('lower', col(column)), code.toLowerCase())];
	if (exceptId) conditions.push({ id: { [Op.ne]: exceptId } });
	const found = await (model as typeof TruckModel).findOne({
		where: { [Op.and]: conditions },
		attributes: ['id'],
		transaction
	});
	return found !== null;
}

/** Does the surveys table exist yet? (It arrives with the survey wizard.) */
async function surveysTablePresent(transaction?: Transaction): Promise<boolean> {
	const [rows] = await sequelize.query(
		`SELECT to_regclass('public.surveys') IS NOT NULL AS present`,
		{
			transaction
		}
	);
	return (rows as { present: boolean }[])[0]?.present === true;
}

/**
 * How many surveys refer to a truck model or battery, by id or by code, as their fleet's
 * `truckModelId` or `batteryId`. 0 while the surveys table does not exist.
 */
export async function surveysReferencingModel(
	refs: string[],
	transaction?: Transaction
): Promise<number> {
	if (refs.length === 0 || !(await surveysTablePresent(transaction))) return 0;
	const [rows] = await sequelize.query(
		`SELECT count(*)::int AS n FROM surveys
		  WHERE data->'fleet'->>'truckModelId' IN (:refs) OR data->'fleet'->>'batteryId' IN (:refs)`,
		{ replacements: { refs }, transaction }
	);
	return (rows as { n: number }[])[0]?.n ?? 0;
}

/**
 * How many surveys carry an equipment SKU anywhere in their data (a chosen setup's bill of
 * materials, say). 0 while the surveys table does not exist.
 */
export async function surveysReferencingSku(
	sku: string,
	transaction?: Transaction
): Promise<number> {
	if (!(await surveysTablePresent(transaction))) return 0;
	const [rows] = await sequelize.query(
		`SELECT count(*)::int AS n FROM surveys
		  WHERE jsonb_path_exists(data, '$.** ? (@ == $sku)', jsonb_build_object('sku', CAST(:sku AS text)))`,
		{ replacements: { sku }, transaction }
	);
	return (rows as { n: number }[])[0]?.n ?? 0;
}

/** Families in use by truck models (retired ones too), A–Z; for the family picker and filter. */
export async function listTruckFamilies(): Promise<string[]> {
	const rows = await TruckModel.findAll({
		attributes: ['family'],
		group: ['family'],
		order: [['family', 'ASC']]
	});
	return rows.map((r) => r.family);
}

async function checkCompatibleBatteries(
	input: TruckModelInput,
	transaction: Transaction
): Promise<CatalogueSaveOutcome<never> | null> {
	if (input.batteryIds.length === 0) return null;
	// FOR SHARE: a battery deleted meanwhile waits for this save, so every link stays valid
	const batteries = await Battery.findAll({
		where: { id: { [Op.in]: input.batteryIds } },
		transaction,
		lock: transaction.LOCK.SHARE
	});
	if (batteries.length !== input.batteryIds.length)
		return { ok: false, reason: 'unknown-batteries' };
	const wrong = batteries.filter(
		(b) => (b.spec as { voltage?: number }).voltage !== input.spec.voltage
	);
	if (wrong.length > 0)
		return { ok: false, reason: 'battery-voltage', codes: wrong.map((b) => b.code).sort() };
	return null;
}

async function saveTruckModel(
	id: string | null,
	input: TruckModelInput
): Promise<CatalogueSaveOutcome<TruckModelRow>> {
	try {
		const outcome = await sequelize.transaction(
			async (transaction): Promise<CatalogueSaveOutcome<TruckModelRow>> => {
				let truck: TruckModel | null = null;
				if (id) {
					truck = await TruckModel.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
					if (!truck) return { ok: false, reason: 'not-found' };
				}
				if (await codeTaken(TruckModel, 'code', input.code, id, transaction)) {
					return { ok: false, reason: 'duplicate', code: input.code };
				}
				const refused = await checkCompatibleBatteries(input, transaction);
				if (refused) return refused;
				const values = {
					code: input.code,
					name: input.name,
					family: input.family,
					capacityKg: input.capacityKg,
					priceCents: input.priceCents,
					costCents: input.costCents,
					spec: input.spec as unknown as Record<string, unknown>
				};
				if (truck) await truck.update(values, { transaction });
				else truck = await TruckModel.create(values, { transaction });
				await TruckModelBattery.destroy({ where: { truckModelId: truck.id }, transaction });
				if (input.batteryIds.length > 0) {
					await TruckModelBattery.bulkCreate(
						input.batteryIds.map((batteryId) => ({ truckModelId: truck!.id, batteryId })),
						{ transaction }
					);
				}
				return { ok: true, row: truckRow(truck, [...input.batteryIds]) };
			}
		);
		if (outcome.ok) clearCatalogueCache();
		return outcome;
	} catch (err) {
		// two admins saving the same new code at once: the unique index decides
		if (isUniqueViolation(err)) return { ok: false, reason: 'duplicate', code: input.code };
		throw err;
	}
}

/** Adds a truck model with its compatible batteries, in one transaction. */
export function createTruckModel(
	input: TruckModelInput
): Promise<CatalogueSaveOutcome<TruckModelRow>> {
	return saveTruckModel(null, input);
}

/** Replaces a truck model's fields and compatible batteries, in one transaction. */
export function updateTruckModel(
	id: string,
	input: TruckModelInput
): Promise<CatalogueSaveOutcome<TruckModelRow>> {
	return saveTruckModel(id, input);
}

async function setRetired(
	model: typeof TruckModel | typeof Battery | typeof Equipment,
	id: string,
	retired: boolean
): Promise<boolean> {
	const [count] = await (model as typeof TruckModel).update({ retired }, { where: { id } });
	if (count > 0) clearCatalogueCache();
	return count > 0;
}

/** Retires a truck model: gone from new surveys' choices, still found for old ones. False if unknown. */
export function retireTruckModel(id: string): Promise<boolean> {
	return setRetired(TruckModel, id, true);
}

/** Offers a retired truck model again. False if unknown. */
export function restoreTruckModel(id: string): Promise<boolean> {
	return setRetired(TruckModel, id, false);
}

/** Deletes a truck model (and its compatibility links) unless a survey refers to it. */
export async function deleteTruckModel(id: string): Promise<CatalogueDeleteOutcome> {
	const outcome = await sequelize.transaction(
		async (transaction): Promise<CatalogueDeleteOutcome> => {
			const truck = await TruckModel.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
			if (!truck) return { ok: false, reason: 'not-found' };
			const surveys = await surveysReferencingModel([truck.id, truck.code], transaction);
			if (surveys > 0) return { ok: false, reason: 'in-use', surveys };
			await truck.destroy({ transaction });
			return { ok: true, code: truck.code };
		}
	);
	if (outcome.ok) clearCatalogueCache();
	return outcome;
}

/** The truck models that list a battery as compatible (retired ones too), by code. */
export async function trucksListingBattery(
	batteryId: string
): Promise<{ id: string; code: string; name: string; retired: boolean }[]> {
	const links = await TruckModelBattery.findAll({ where: { batteryId } });
	if (links.length === 0) return [];
	const trucks = await TruckModel.findAll({
		where: { id: { [Op.in]: links.map((l) => l.truckModelId) } },
		order: [['code', 'ASC']]
	});
	return trucks.map((t) => ({ id: t.id, code: t.code, name: t.name, retired: t.retired }));
}

/** The active batteries a truck model lists as compatible, by code. */
export async function compatibleBatteries(truckModelId: string): Promise<BatteryRow[]> {
	const links = await TruckModelBattery.findAll({ where: { truckModelId } });
	if (links.length === 0) return [];
	const rows = await Battery.findAll({
		where: { id: { [Op.in]: links.map((l) => l.batteryId) }, retired: false },
		order: [['code', 'ASC']]
	});
	return rows.map(batteryRow);
}

async function saveBattery(
	id: string | null,
	input: BatteryInput
): Promise<CatalogueSaveOutcome<BatteryRow>> {
	try {
		const outcome = await sequelize.transaction(
			async (transaction): Promise<CatalogueSaveOutcome<BatteryRow>> => {
				let battery: Battery | null = null;
				if (id) {
					battery = await Battery.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
					if (!battery) return { ok: false, reason: 'not-found' };
				}
				if (await codeTaken(Battery, 'code', input.code, id, transaction)) {
					return { ok: false, reason: 'duplicate', code: input.code };
				}
				const values = {
					code: input.code,
					name: input.name,
					priceCents: input.priceCents,
					costCents: input.costCents,
					spec: input.spec as unknown as Record<string, unknown>
				};
				if (battery) await battery.update(values, { transaction });
				else battery = await Battery.create(values, { transaction });
				return { ok: true, row: batteryRow(battery) };
			}
		);
		if (outcome.ok) clearCatalogueCache();
		return outcome;
	} catch (err) {
		if (isUniqueViolation(err)) return { ok: false, reason: 'duplicate', code: input.code };
		throw err;
	}
}

export function createBattery(input: BatteryInput): Promise<CatalogueSaveOutcome<BatteryRow>> {
	return saveBattery(null, input);
}

export function updateBattery(
	id: string,
	input: BatteryInput
): Promise<CatalogueSaveOutcome<BatteryRow>> {
	return saveBattery(id, input);
}

/** Retires a battery: gone from new surveys' choices and the engine's pricing, still found by id. */
export function retireBattery(id: string): Promise<boolean> {
	return setRetired(Battery, id, true);
}

export function restoreBattery(id: string): Promise<boolean> {
	return setRetired(Battery, id, false);
}

/** Deletes a battery (and its compatibility links) unless a survey refers to it. */
export async function deleteBattery(id: string): Promise<CatalogueDeleteOutcome> {
	const outcome = await sequelize.transaction(
		async (transaction): Promise<CatalogueDeleteOutcome> => {
			const battery = await Battery.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
			if (!battery) return { ok: false, reason: 'not-found' };
			const surveys = await surveysReferencingModel([battery.id, battery.code], transaction);
			if (surveys > 0) return { ok: false, reason: 'in-use', surveys };
			await battery.destroy({ transaction });
			return { ok: true, code: battery.code };
		}
	);
	if (outcome.ok) clearCatalogueCache();
	return outcome;
}

/** An equipment item by id (retired ones too). */
export async function findEquipment(id: string): Promise<EquipmentRow | null> {
	if (!UUID.test(id)) return null;
	const row = await Equipment.findByPk(id);
	return row ? equipmentRow(row) : null;
}

async function saveEquipment(
	id: string | null,
	input: EquipmentInput
): Promise<CatalogueSaveOutcome<EquipmentRow>> {
	try {
		const outcome = await sequelize.transaction(
			async (transaction): Promise<CatalogueSaveOutcome<EquipmentRow>> => {
				let item: Equipment | null = null;
				if (id) {
					item = await Equipment.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
					if (!item) return { ok: false, reason: 'not-found' };
				}
				if (await codeTaken(Equipment, 'sku', input.sku, id, transaction)) {
					return { ok: false, reason: 'duplicate', code: input.sku };
				}
				const values = {
					sku: input.sku,
					kind: input.kind,
					name: input.name,
					priceCents: input.priceCents,
					costCents: input.costCents,
					spec: input.spec as unknown as Record<string, unknown>
				};
				if (item) await item.update(values, { transaction });
				else item = await Equipment.create(values, { transaction });
				return { ok: true, row: equipmentRow(item) };
			}
		);
		if (outcome.ok) clearCatalogueCache();
		return outcome;
	} catch (err) {
		if (isUniqueViolation(err)) return { ok: false, reason: 'duplicate', code: input.sku };
		throw err;
	}
}

export function createEquipment(
	input: EquipmentInput
): Promise<CatalogueSaveOutcome<EquipmentRow>> {
	return saveEquipment(null, input);
}

export function updateEquipment(
	id: string,
	input: EquipmentInput
): Promise<CatalogueSaveOutcome<EquipmentRow>> {
	return saveEquipment(id, input);
}

/** Retires an equipment item: the engine stops picking it; quotes that name it keep their lines. */
export function retireEquipment(id: string): Promise<boolean> {
	return setRetired(Equipment, id, true);
}

export function restoreEquipment(id: string): Promise<boolean> {
	return setRetired(Equipment, id, false);
}

/** Deletes an equipment item unless a survey carries its SKU. */
export async function deleteEquipment(id: string): Promise<CatalogueDeleteOutcome> {
	const outcome = await sequelize.transaction(
		async (transaction): Promise<CatalogueDeleteOutcome> => {
			const item = await Equipment.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
			if (!item) return { ok: false, reason: 'not-found' };
			const surveys = await surveysReferencingSku(item.sku, transaction);
			if (surveys > 0) return { ok: false, reason: 'in-use', surveys };
			await item.destroy({ transaction });
			return { ok: true, code: item.sku };
		}
	);
	if (outcome.ok) clearCatalogueCache();
	return outcome;
}
