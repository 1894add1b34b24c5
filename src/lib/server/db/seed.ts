import { sequelize } from './index';
import { existsSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { Battery, Equipment, Team, TruckModel, TruckModelBattery, User } from './models';
import { Contact, Customer, Site } from './models/customers';
import { hashPassword } from '../auth/password';
import type { Role, UnitSystem } from './models';
import { TaxRate } from './models/pricing';
import { lineKindForEquipment } from '../quotes/price-book-kinds';
import { countPriceBookVersions, createDraftVersion, publishVersion, type PriceItem } from '../repositories/pricing';

const SEED_DIR = path.resolve(process.env.SEED_DIR ?? 'seed-data');

function readJson<T>(name: string): T | null {
	const file = path.join(SEED_DIR, name);
	return existsSync(file) ? (JSON.parse(readFileSync(file, 'utf8')) as T) : null;
}

interface PeopleFile {
	teams: string[];
	users: { email: string; name: string; role: Role; team: string | null; unitSystem: UnitSystem }[];
	password: string;
}

interface CatalogueFile {
	trucks: {
		code: string;
		name: string;
		family: string;
		capacityKg: number;
		priceCents?: number;
		costCents?: number;
		compatibleBatteries: string[];
		spec: Record<string, unknown>;
	}[];
	batteries: { code: string; name: string; priceCents?: number; costCents?: number; spec: Record<string, unknown> }[];
	equipment: {
		sku: string;
		kind: string;
		name: string;
		priceCents?: number;
		costCents?: number;
		spec?: Record<string, unknown>;
	}[];
}

interface CustomersFile {
	customers: {
		name: string;
		accountNumber: string;
		owner: string;
		notes: string;
		sites: {
			name: string;
			addressLine1: string;
			addressLine2: string;
			city: string;
			postalCode: string;
			country: string;
			regionCode: string;
		}[];
		contacts: { name: string; roleTitle: string; email: string; phone: string; site: string | null }[];
	}[];
}

/**
 * Demo customers, matched by name; their sites and contacts by name within the customer.
 * Existing records are left as they are.
 */
async function seedCustomers(file: CustomersFile): Promise<number> {
	let added = 0;
	for (const c of file.customers) {
		const owner = await User.findOne({ where: { email: c.owner } });
		let customer = await Customer.findOne({ where: { name: c.name }, order: [['createdAt', 'ASC']] });
		if (!customer) {
			customer = await Customer.create({
				name: c.name,
				accountNumber: c.accountNumber || null,
				notes: c.notes,
				ownerId: owner?.id ?? null,
				teamId: owner?.teamId ?? null
			});
			added++;
		}
		const siteIds = new Map<string, string>();
		for (const s of c.sites) {
			const [site, created] = await Site.findOrCreate({
				where: { customerId: customer.id, name: s.name },
				defaults: { ...s, customerId: customer.id }
			});
			siteIds.set(s.name, site.id);
			if (created) added++;
		}
		for (const k of c.contacts) {
			const [, created] = await Contact.findOrCreate({
				where: { customerId: customer.id, name: k.name },
				defaults: {
					customerId: customer.id,
					siteId: k.site ? (siteIds.get(k.site) ?? null) : null,
					name: k.name,
					roleTitle: k.roleTitle,
					email: k.email,
					phone: k.phone
				}
			});
			if (created) added++;
		}
	}
	return added;
}

/** Adds whatever demo records are missing; returns how many were added. */
export async function seedDemo(): Promise<number> {
	let added = 0;
	const people = readJson<PeopleFile>('people.json');
	if (people) {
		const teamIds = new Map<string, string>();
		for (const name of people.teams) {
			const [team, created] = await Team.findOrCreate({ where: { name }, defaults: { name } });
			teamIds.set(name, team.id);
			if (created) added++;
		}
		const passwordHash = await hashPassword(people.password);
		for (const u of people.users) {
			const [, created] = await User.findOrCreate({
				where: { email: u.email },
				defaults: {
					email: u.email,
					name: u.name,
					role: u.role,
					teamId: u.team ? (teamIds.get(u.team) ?? null) : null,
					unitSystem: u.unitSystem,
					passwordHash
				}
			});
			if (created) added++;
		}
	}

	const catalogue = readJson<CatalogueFile>('catalogue.json');
	if (catalogue) {
		const batteryIds = new Map<string, string>();
		for (const b of catalogue.batteries) {
			const [row, created] = await Battery.findOrCreate({
				where: { code: b.code },
				defaults: { code: b.code, name: b.name, spec: b.spec, priceCents: b.priceCents ?? 0, costCents: b.costCents ?? 0 }
			});
			batteryIds.set(b.code, row.id);
			if (created) added++;
		}
		for (const t of catalogue.trucks) {
			const [row, created] = await TruckModel.findOrCreate({
				where: { code: t.code },
				defaults: {
					code: t.code,
					name: t.name,
					family: t.family,
					capacityKg: t.capacityKg,
					spec: t.spec,
					priceCents: t.priceCents ?? 0,
					costCents: t.costCents ?? 0
				}
			});
			if (created) {
				added++;
				const links = t.compatibleBatteries
					.map((code) => batteryIds.get(code))
					.filter((id): id is string => !!id)
					.map((batteryId) => ({ truckModelId: row.id, batteryId }));
				await TruckModelBattery.bulkCreate(links, { ignoreDuplicates: true });
			}
		}
		for (const e of catalogue.equipment) {
			const [, created] = await Equipment.findOrCreate({
				where: { sku: e.sku },
				defaults: {
					sku: e.sku,
					kind: e.kind,
					name: e.name,
					spec: e.spec ?? {},
					priceCents: e.priceCents ?? 0,
					costCents: e.costCents ?? 0
				}
			});
			if (created) added++;
		}
	}

	const customers = readJson<CustomersFile>('customers.json');
	if (customers) added += await seedCustomers(customers);
	const surveys = readJson<SurveysFile>('surveys.json');
	if (surveys) added += await seedSurveys(surveys);
	added += await seedPricing();
	return added;
}

/** Invented demo tax rates by region code (basis points: 7.25 % = 725 bp). */
const DEMO_TAX_RATES = [
	{ regionCode: 'HB', label: 'Harbour district', rateBp: 725 },
	{ regionCode: 'UP', label: 'Upland county', rateBp: 650 },
	{ regionCode: 'EXEMPT', label: 'Tax-exempt customer (certificate on file)', rateBp: 0 },
	// the demo customers' sites use these two codes; the rates are invented for the demo
	{ regionCode: 'WA', label: 'Washington sites (demo rate)', rateBp: 890 },
	{ regionCode: 'OR', label: 'Oregon sites (demo rate)', rateBp: 0 }
];

/** Invented service lines every quote can carry, cents. */
const SERVICE_ITEMS: PriceItem[] = [
	{ sku: 'TW-FREIGHT', description: 'Freight to site, per truck', kind: 'freight', listCents: 65_000, costCents: 48_000 },
	{
		sku: 'TW-INSTALL',
		description: 'Installation, commissioning and operator handover, per truck',
		kind: 'installation',
		listCents: 45_000,
		costCents: 29_000
	}
];

/**
 * Demo tax rates that are missing (by region code), and — only when no price-book version exists
 * at all — an opening ACTIVE version priced from the catalogue: every truck model (SKU = truck code),
 * battery and equipment item that is not retired, plus freight and installation.
 */
async function seedPricing(): Promise<number> {
	let added = 0;
	for (const rate of DEMO_TAX_RATES) {
		const [, created] = await TaxRate.findOrCreate({ where: { regionCode: rate.regionCode }, defaults: rate });
		if (created) added++;
	}
	if ((await countPriceBookVersions()) > 0) return added;

	const [trucks, batteries, equipment] = await Promise.all([
		TruckModel.findAll({ where: { retired: false }, order: [['code', 'ASC']] }),
		Battery.findAll({ where: { retired: false }, order: [['code', 'ASC']] }),
		Equipment.findAll({ where: { retired: false }, order: [['sku', 'ASC']] })
	]);
	const items: PriceItem[] = [
		...trucks.map((t) => ({ sku: t.code, description: t.name, kind: 'truck' as const, listCents: t.priceCents, costCents: t.costCents })),
		...batteries.map((b) => ({ sku: b.code, description: b.name, kind: 'battery' as const, listCents: b.priceCents, costCents: b.costCents })),
		...equipment.map((e) => ({
			sku: e.sku,
			description: e.name,
			kind: lineKindForEquipment(e.kind),
			listCents: e.priceCents,
			costCents: e.costCents
		})),
		...SERVICE_ITEMS
	];
	const id = await createDraftVersion({
		label: 'Opening price book',
		effectiveDate: `${new Date().getUTCFullYear()}-01-01`,
		createdBy: null,
		items
	});
	const published = await publishVersion(id, null);
	if (!published.ok) throw new Error(`could not publish the opening price book: ${published.reason}`);
	return added + items.length + 1;
}

interface SurveysFile {
	surveys: {
		key: string;
		customer: string;
		site: string;
		owner: string;
		currentStep: string;
		truck: string;
		battery: string;
		data: Record<string, Record<string, unknown>>;
	}[];
}

/** Demo surveys, matched by their key (stored as the survey's client token); never duplicated. */
async function seedSurveys(file: SurveysFile): Promise<number> {
	let added = 0;
	for (const s of file.surveys) {
		const [row] = (await sequelize.query(
			`SELECT c.id AS customer_id, st.id AS site_id, u.id AS owner_id, u.team_id,
			        (SELECT id FROM truck_models WHERE code = :truck) AS truck_id,
			        (SELECT id FROM batteries WHERE code = :battery) AS battery_id
			 FROM customers c JOIN sites st ON st.customer_id = c.id, users u
			 WHERE c.name = :customer AND st.name = :site AND u.email = :owner`,
			{ replacements: { truck: s.truck, battery: s.battery, customer: s.customer, site: s.site, owner: s.owner } }
		)) as [{ customer_id: string; site_id: string; owner_id: string; team_id: string | null; truck_id: string; battery_id: string }[], unknown];
		if (!row[0]) continue;
		const r = row[0];
		const data = structuredClone(s.data);
		data.site = { ...data.site, customerId: r.customer_id, siteId: r.site_id };
		data.fleet = { ...data.fleet, truckModelId: r.truck_id, batteryId: r.battery_id };
		const [inserted] = (await sequelize.query(
			`INSERT INTO surveys (customer_id, site_id, owner_id, team_id, current_step, data, client_token)
			 VALUES (:customerId, :siteId, :ownerId, :teamId, :step, :data::jsonb, :key)
			 ON CONFLICT (client_token) DO NOTHING RETURNING id`,
			{
				replacements: {
					customerId: r.customer_id,
					siteId: r.site_id,
					ownerId: r.owner_id,
					teamId: r.team_id,
					step: s.currentStep,
					data: JSON.stringify(data),
					key: `seed:${s.key}`
				}
			}
		)) as [{ id: string }[], unknown];
		if (inserted.length) added++;
	}
	return added;
}
