/**
 * The price book, the company settings and the tax rates. The only code that touches their models;
 * every function returns plain objects. Money is integer cents, rates whole basis points
 * (1 % = 100 bp).
 *
 * For the quote builder: `getActivePriceBook`, `priceItems`, `getCompanySettings`, `taxRateFor`
 * and `getLogo`. A quote stores the id of the version it was priced on; versions are never changed
 * once published (the database refuses it too), so pricing again from that id gives the same cents.
 */
import { randomUUID } from 'node:crypto';
import { mkdir, readFile, rename, unlink, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { Op, QueryTypes, UniqueConstraintError, type WhereOptions } from 'sequelize';
import { sequelize } from '../db';
import {
	CompanySettings,
	PriceBookItem,
	PriceBookVersion,
	TaxRate,
	type PriceBookStatus
} from '../db/models/pricing';
import { config } from '../config';
import { diffPriceBooks, type PriceBookDiff } from '../quotes/price-book-diff';
import type { LineKind } from '../quotes/pricing';
import { inspectLogo } from '../settings/logo';
import type { CompanySettingsInput } from '../../schemas/settings';

export type { PriceBookStatus } from '../db/models/pricing';

// ---------------------------------------------------------------------------------------------
// Price book

/** The version quotes are priced from now. */
export interface ActivePriceBook {
	id: string;
	label: string;
	/** 'YYYY-MM-DD' */
	effectiveDate: string;
}

/** One priced item of a version. */
export interface PriceItem {
	sku: string;
	description: string;
	kind: LineKind;
	/** list price of one unit, cents */
	listCents: number;
	/** dealer's cost of one unit, cents */
	costCents: number;
}

export interface PriceBookVersionRow {
	id: string;
	label: string;
	/** 'YYYY-MM-DD' */
	effectiveDate: string;
	status: PriceBookStatus;
	itemCount: number;
	/** ISO timestamp */
	createdAt: string;
	createdByName: string | null;
	/** ISO timestamp; null while a draft */
	publishedAt: string | null;
	publishedByName: string | null;
}

export interface PriceItemPage {
	items: PriceItem[];
	/** items matching the search, on all pages */
	total: number;
	/** 1-based, clamped to the pages that exist */
	page: number;
	pageSize: number;
	pageCount: number;
}

/** Why a change to a version was refused. */
export type VersionRefusal = 'not-found' | 'published';
export type VersionChange = { ok: true } | { ok: false; reason: VersionRefusal };

/** Items a page of the price book shows. */
export const PRICE_ITEMS_PAGE_SIZE = 50;
/** Rows per INSERT when a draft is stored (well under PostgreSQL's 65 535 parameters). */
const INSERT_CHUNK = 1000;
/** Serialises publishing: two admins publishing at once cannot leave two active versions. */
const PUBLISH_LOCK_KEY = 0x7072_6963_65; // "price"

function priceItem(i: PriceBookItem): PriceItem {
	return {
		sku: i.sku,
		description: i.description,
		kind: i.kind,
		listCents: i.listCents,
		costCents: i.costCents
	};
}

/**
 * The active price-book version, or null before any version is published. One query.
 * Read it once when a quote is priced and store its id on the quote.
 */
export async function getActivePriceBook(): Promise<ActivePriceBook | null> {
	const v = await PriceBookVersion.findOne({ where: { status: 'active' } });
	return v ? { id: v.id, label: v.label, effectiveDate: v.effectiveDate } : null;
}

/**
 * The items of version `versionId` with these SKUs, keyed by SKU, in ONE query. SKUs match
 * exactly (letter case included); a SKU the version lacks is simply absent from the map, so the
 * caller decides how to show it. Duplicate SKUs in the argument are fine.
 */
export async function priceItems(
	versionId: string,
	skus: readonly string[]
): Promise<Map<string, PriceItem>> {
	const wanted = [...new Set(skus)];
	if (wanted.length === 0 || !isUuid(versionId)) return new Map();
	const rows = await PriceBookItem.findAll({ where: { versionId, sku: { [Op.in]: wanted } } });
	return new Map(rows.map((r) => [r.sku, priceItem(r)]));
}

function escapeLike(text: string): string {
	return text.replace(/[\\%_]/g, (c) => `\\${c}`);
}

/**
 * A page of a version's items, by SKU: `q` searches SKU and description (any letter case), `kind`
 * keeps one kind, `page` is 1-based (out-of-range pages give the last page). Two queries.
 */
export async function listPriceItems(
	versionId: string,
	opts: { q?: string; kind?: LineKind | null; page?: number; pageSize?: number } = {}
): Promise<PriceItemPage> {
	const pageSize = opts.pageSize ?? PRICE_ITEMS_PAGE_SIZE;
	const where: WhereOptions<PriceBookItem>[] = [{ versionId }];
	const q = opts.q?.trim();
	if (q) {
		const pattern = `%${escapeLike(q)}%`;
		where.push({
			[Op.or]: [{ sku: { [Op.iLike]: pattern } }, { description: { [Op.iLike]: pattern } }]
		});
	}
	if (opts.kind) where.push({ kind: opts.kind });
	const total = isUuid(versionId) ? await PriceBookItem.count({ where: { [Op.and]: where } }) : 0;
	const pageCount = Math.max(1, Math.ceil(total / pageSize));
	const page = Math.min(Math.max(1, Math.trunc(opts.page ?? 1) || 1), pageCount);
	const rows =
		total === 0
			? []
			: await PriceBookItem.findAll({
					where: { [Op.and]: where },
					order: [['sku', 'ASC']],
					limit: pageSize,
					offset: (page - 1) * pageSize
				});
	return { items: rows.map(priceItem), total, page, pageSize, pageCount };
}

/** Every item of a version, by SKU (for the CSV download and the review). */
export async function allPriceItems(versionId: string): Promise<PriceItem[]> {
	if (!isUuid(versionId)) return [];
	const rows = await PriceBookItem.findAll({ where: { versionId }, order: [['sku', 'ASC']] });
	return rows.map(priceItem);
}

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;
function isUuid(id: string): boolean {
	return UUID.test(id);
}

interface VersionSqlRow {
	id: string;
	label: string;
	effective_date: string;
	status: PriceBookStatus;
	item_count: number;
	created_at: Date;
	created_by_name: string | null;
	published_at: Date | null;
	published_by_name: string | null;
}

const VERSION_SELECT = `
	SELECT v.id, v.label, to_char(v.effective_date, 'YYYY-MM-DD') AS effective_date, v.status,
		(SELECT count(*) FROM price_book_items i WHERE i.version_id = v.id)::int AS item_count,
		v.created_at, cu.name AS created_by_name, v.published_at, pu.name AS published_by_name
	FROM price_book_versions v
	LEFT JOIN users cu ON cu.id = v.created_by
	LEFT JOIN users pu ON pu.id = v.published_by`;

function versionRow(r: VersionSqlRow): PriceBookVersionRow {
	return {
		id: r.id,
		label: r.label,
		effectiveDate: r.effective_date,
		status: r.status,
		itemCount: r.item_count,
		createdAt: new Date(r.created_at).toISOString(),
		createdByName: r.created_by_name,
		publishedAt: r.published_at ? new Date(r.published_at).toISOString() : null,
		publishedByName: r.published_by_name
	};
}

/** Every version: the active one first, then drafts, then archived ones, newest first. One query. */
export async function listPriceBookVersions(): Promise<PriceBookVersionRow[]> {
	const rows = await sequelize.query<VersionSqlRow>(
		`${VERSION_SELECT}
		ORDER BY CASE v.status WHEN 'active' THEN 0 WHEN 'draft' THEN 1 ELSE 2 END,
			coalesce(v.published_at, v.created_at) DESC, v.created_at DESC`,
		{ type: QueryTypes.SELECT }
	);
	return rows.map(versionRow);
}

/** One version with its item count, or null. */
export async function getPriceBookVersion(id: string): Promise<PriceBookVersionRow | null> {
	if (!isUuid(id)) return null;
	const rows = await sequelize.query<VersionSqlRow>(`${VERSION_SELECT} WHERE v.id = :id`, {
		type: QueryTypes.SELECT,
		replacements: { id }
	});
	return rows[0] ? versionRow(rows[0]) : null;
}

/**
 * Stores a new DRAFT version with all its items in one transaction: either every item is stored or
 * nothing is. The items come checked from `parsePriceBookCsv` (unique SKUs, valid kinds and cents).
 * Returns the new version's id.
 */
export async function createDraftVersion(input: {
	label: string;
	effectiveDate: string;
	createdBy: string | null;
	items: readonly PriceItem[];
}): Promise<string> {
	return sequelize.transaction(async (transaction) => {
		const version = await PriceBookVersion.create(
			{ label: input.label, effectiveDate: input.effectiveDate, createdBy: input.createdBy },
			{ transaction }
		);
		for (let start = 0; start < input.items.length; start += INSERT_CHUNK) {
			await PriceBookItem.bulkCreate(
				input.items.slice(start, start + INSERT_CHUNK).map((item) => ({
					versionId: version.id,
					sku: item.sku,
					description: item.description,
					kind: item.kind,
					listCents: item.listCents,
					costCents: item.costCents
				})),
				{ transaction, validate: false }
			);
		}
		return version.id;
	});
}

async function refusal(id: string): Promise<VersionChange> {
	const exists = isUuid(id) && (await PriceBookVersion.count({ where: { id } })) > 0;
	return { ok: false, reason: exists ? 'published' : 'not-found' };
}

/** Renames a draft or changes its effective date; published versions are refused. */
export async function updateDraftVersion(
	id: string,
	input: { label: string; effectiveDate: string }
): Promise<VersionChange> {
	if (!isUuid(id)) return { ok: false, reason: 'not-found' };
	const [count] = await PriceBookVersion.update(
		{ label: input.label, effectiveDate: input.effectiveDate },
		{ where: { id, status: 'draft' } }
	);
	return count > 0 ? { ok: true } : refusal(id);
}

/** Deletes a draft and its items; published versions are refused (quotes may refer to them). */
export async function deleteDraftVersion(id: string): Promise<VersionChange> {
	if (!isUuid(id)) return { ok: false, reason: 'not-found' };
	const count = await PriceBookVersion.destroy({ where: { id, status: 'draft' } });
	return count > 0 ? { ok: true } : refusal(id);
}

/**
 * Publishes a draft: in one transaction the active version (if any) becomes archived and the draft
 * becomes active, stamped with who and when. Refused for a version that is not a draft or has no
 * items. Returns the id of the version it replaced.
 */
export async function publishVersion(
	id: string,
	publishedBy: string | null
): Promise<
	{ ok: true; archivedId: string | null } | { ok: false; reason: VersionRefusal | 'empty' }
> {
	if (!isUuid(id)) return { ok: false, reason: 'not-found' };
	return sequelize.transaction(async (transaction) => {
		await sequelize.query('SELECT pg_advisory_xact_lock(:key)', {
			replacements: { key: PUBLISH_LOCK_KEY },
			transaction
		});
		const version = await PriceBookVersion.findByPk(id, {
			transaction,
			lock: transaction.LOCK.UPDATE
		});
		if (!version) return { ok: false, reason: 'not-found' } as const;
		if (version.status !== 'draft') return { ok: false, reason: 'published' } as const;
		if ((await PriceBookItem.count({ where: { versionId: id }, transaction })) === 0)
			return { ok: false, reason: 'empty' } as const;
		const [, archived] = await PriceBookVersion.update(
			{ status: 'archived' },
			{ where: { status: 'active' }, transaction, returning: true }
		);
		await version.update(
			{ status: 'active', publishedAt: new Date(), publishedBy },
			{ transaction }
		);
		return { ok: true, archivedId: archived[0]?.id ?? null } as const;
	});
}

/**
 * What version `id` changes against the active version: new, removed and changed items.
 * Null when the version does not exist. Against no active version every item is new.
 */
export async function diffAgainstActive(
	id: string
): Promise<(PriceBookDiff & { activeId: string | null }) | null> {
	const version = await getPriceBookVersion(id);
	if (!version) return null;
	const active = await getActivePriceBook();
	const [before, after] = await Promise.all([
		active && active.id !== id ? allPriceItems(active.id) : Promise.resolve([]),
		allPriceItems(id)
	]);
	if (active?.id === id)
		return { added: [], removed: [], changed: [], unchangedCount: after.length, activeId: id };
	return { ...diffPriceBooks(before, after), activeId: active?.id ?? null };
}

/** How many versions exist (the seed adds the first one only when there is none). */
export async function countPriceBookVersions(): Promise<number> {
	return PriceBookVersion.count();
}

// ---------------------------------------------------------------------------------------------
// Company settings

export interface CompanySettingsRow extends CompanySettingsInput {
	/** server-made file name of the logo under UPLOAD_DIR, or null */
	logoPath: string | null;
	/** ISO timestamp of the last change */
	updatedAt: string;
}

/** Used only if the settings row were missing (the migration creates it). */
const FALLBACK_SETTINGS: CompanySettingsRow = {
	dealerName: 'Dealer',
	address: '',
	phone: '',
	email: '',
	logoPath: null,
	repDiscountAuthorityBp: 0,
	marginFloorBp: 0,
	depositShareBp: 0,
	quoteValidityDays: 30,
	termsText: '',
	currency: 'USD',
	timeZone: 'UTC',
	updatedAt: new Date(0).toISOString()
};

/**
 * The dealer's settings: name, address, contact, logo file, rep discount authority, margin floor
 * and deposit share (basis points), quote validity (days), terms, currency and time zone.
 */
export async function getCompanySettings(): Promise<CompanySettingsRow> {
	const s = await CompanySettings.findByPk(1);
	if (!s) return { ...FALLBACK_SETTINGS };
	return {
		dealerName: s.dealerName,
		address: s.address,
		phone: s.phone,
		email: s.email,
		logoPath: s.logoPath,
		repDiscountAuthorityBp: s.repDiscountAuthorityBp,
		marginFloorBp: s.marginFloorBp,
		depositShareBp: s.depositShareBp,
		quoteValidityDays: s.quoteValidityDays,
		termsText: s.termsText,
		currency: s.currency,
		timeZone: s.timeZone,
		updatedAt: s.updatedAt.toISOString()
	};
}

/** Saves the settings (everything but the logo). */
export async function updateCompanySettings(
	input: CompanySettingsInput,
	updatedBy: string | null
): Promise<void> {
	const [count] = await CompanySettings.update({ ...input, updatedBy }, { where: { id: 1 } });
	if (count === 0) await CompanySettings.create({ id: 1, ...input, updatedBy, logoPath: null });
}

async function currentLogoPath(): Promise<string | null> {
	const s = await CompanySettings.findByPk(1, { attributes: ['logoPath'] });
	return s?.logoPath ?? null;
}

// ---------------------------------------------------------------------------------------------
// Logo

const LOGO_NAME = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}\.(png|jpg)$/;

function logoFile(name: string): string {
	if (!LOGO_NAME.test(name)) throw new Error(`not a stored logo name: ${JSON.stringify(name)}`);
	return path.join(path.resolve(config.uploadDir), name);
}

/**
 * Checks and stores a new logo (PNG or JPEG by its bytes, ≤ 2 MB; see settings/logo.ts) as
 * `<uuid>.<ext>` under UPLOAD_DIR, points the settings at it and removes the previous file.
 */
export async function setLogo(
	bytes: Uint8Array,
	updatedBy: string | null
): Promise<{ ok: true; logoPath: string } | { ok: false; message: string }> {
	const check = inspectLogo(bytes);
	if (!check.ok) return check;
	const name = `${randomUUID()}.${check.ext}`;
	const file = logoFile(name);
	await mkdir(path.dirname(file), { recursive: true });
	// write beside, then rename: a reader never sees half a file
	await writeFile(`${file}.part`, bytes, { flag: 'wx' });
	await rename(`${file}.part`, file);
	let previous: string | null = null;
	try {
		previous = await sequelize.transaction(async (transaction) => {
			const s = await CompanySettings.findByPk(1, { transaction, lock: transaction.LOCK.UPDATE });
			if (!s) throw new Error('company_settings row is missing; run the migrations');
			const old = s.logoPath;
			await s.update({ logoPath: name, updatedBy }, { transaction });
			return old;
		});
	} catch (err) {
		await unlink(file).catch(() => undefined);
		throw err;
	}
	if (previous) await unlink(logoFile(previous)).catch(() => undefined);
	return { ok: true, logoPath: name };
}

/** Removes the logo from the settings and deletes its file. */
export async function removeLogo(updatedBy: string | null): Promise<void> {
	const previous = await currentLogoPath();
	await CompanySettings.update({ logoPath: null, updatedBy }, { where: { id: 1 } });
	if (previous) await unlink(logoFile(previous)).catch(() => undefined);
}

/** The logo's bytes and type, or null when there is none (or its file is gone). */
export async function getLogoFile(): Promise<{
	bytes: Buffer;
	mime: 'image/png' | 'image/jpeg';
	name: string;
} | null> {
	const name = await currentLogoPath();
	if (!name || !LOGO_NAME.test(name)) return null;
	try {
		const bytes = await readFile(logoFile(name));
		return { bytes, mime: name.endsWith('.png') ? 'image/png' : 'image/jpeg', name };
	} catch {
		return null;
	}
}

/** The dealer logo's bytes (PNG or JPEG, checked on upload) for the quote PDF, or null. */
export async function getLogo(): Promise<Buffer | null> {
	return (await getLogoFile())?.bytes ?? null;
}

// ---------------------------------------------------------------------------------------------
// Tax rates

export interface TaxRateRow {
	id: string;
	/** upper case, e.g. "HB" */
	regionCode: string;
	label: string;
	/** basis points: 7.25 % = 725 */
	rateBp: number;
}

function taxRow(t: TaxRate): TaxRateRow {
	return { id: t.id, regionCode: t.regionCode, label: t.label, rateBp: t.rateBp };
}

/** Every tax rate, by region code. */
export async function listTaxRates(): Promise<TaxRateRow[]> {
	const rows = await TaxRate.findAll({ order: [['regionCode', 'ASC']] });
	return rows.map(taxRow);
}

/**
 * The sales tax of a region, or null when none is set. The code is matched ignoring case and
 * surrounding spaces. The caller stores `rateBp` on the quote: later edits do not change it.
 */
export async function taxRateFor(regionCode: string): Promise<Omit<TaxRateRow, 'id'> | null> {
	const code = regionCode.trim().toUpperCase();
	if (code === '') return null;
	const t = await TaxRate.findOne({ where: { regionCode: code } });
	return t ? { regionCode: t.regionCode, label: t.label, rateBp: t.rateBp } : null;
}

type TaxInput = { regionCode: string; label: string; rateBp: number };
export type TaxChange = { ok: true; id: string } | { ok: false; reason: 'not-found' | 'duplicate' };

/** Adds a region's rate; refused when the region already has one. */
export async function addTaxRate(input: TaxInput): Promise<TaxChange> {
	try {
		const t = await TaxRate.create({ ...input, regionCode: input.regionCode.toUpperCase() });
		return { ok: true, id: t.id };
	} catch (err) {
		if (err instanceof UniqueConstraintError) return { ok: false, reason: 'duplicate' };
		throw err;
	}
}

/** Changes a region's code, name or rate. */
export async function updateTaxRate(id: string, input: TaxInput): Promise<TaxChange> {
	if (!isUuid(id)) return { ok: false, reason: 'not-found' };
	try {
		const [count] = await TaxRate.update(
			{ ...input, regionCode: input.regionCode.toUpperCase() },
			{ where: { id } }
		);
		return count > 0 ? { ok: true, id } : { ok: false, reason: 'not-found' };
	} catch (err) {
		if (err instanceof UniqueConstraintError) return { ok: false, reason: 'duplicate' };
		throw err;
	}
}

/** Removes a region's rate; false when it was already gone. */
export async function removeTaxRate(id: string): Promise<boolean> {
	if (!isUuid(id)) return false;
	return (await TaxRate.destroy({ where: { id } })) > 0;
}
