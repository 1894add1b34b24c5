import { QueryTypes, UniqueConstraintError, type Transaction } from 'sequelize';
import { sequelize } from '../db';
import { Contact, Customer, Site } from '../db/models/customers';
import { User } from '../db/models';
import type { ContactInput, CustomerInput, CustomerSort, SiteInput } from '../../schemas/customer';

export const CUSTOMERS_PER_PAGE = 20;

export interface SiteRow {
	id: string;
	customerId: string;
	name: string;
	addressLine1: string;
	addressLine2: string;
	city: string;
	postalCode: string;
	country: string;
	regionCode: string;
}

export interface ContactRow {
	id: string;
	customerId: string;
	siteId: string | null;
	siteName: string | null;
	name: string;
	roleTitle: string;
	email: string;
	phone: string;
}

export interface CustomerListRow {
	id: string;
	name: string;
	accountNumber: string | null;
	ownerName: string | null;
	/** distinct site cities, alphabetical */
	cities: string[];
	siteCount: number;
	createdAt: string;
	updatedAt: string;
}

export interface CustomerPage {
	rows: CustomerListRow[];
	total: number;
	page: number;
	pageCount: number;
	pageSize: number;
}

export interface CustomerDetail {
	id: string;
	name: string;
	accountNumber: string | null;
	notes: string;
	ownerId: string | null;
	ownerName: string | null;
	teamId: string | null;
	createdAt: string;
	updatedAt: string;
	sites: SiteRow[];
	contacts: ContactRow[];
}

export interface PickerCustomer {
	id: string;
	name: string;
	accountNumber: string | null;
	sites: SiteRow[];
}

export type SaveResult = { ok: true; id: string } | { ok: false; field: 'accountNumber' | 'siteId'; message: string } | { ok: false; notFound: true };

const ACCOUNT_TAKEN = 'Another customer already has this account number.';

/** `%…%` for ILIKE with the user's text taken literally (`%`, `_` and `\` escaped). */
function containsPattern(q: string): string {
	return `%${q.replace(/[\\%_]/g, (c) => '\\' + c)}%`;
}

// Whitelisted ORDER BY clauses; `id` breaks ties so pages never overlap.
const ORDER: Record<CustomerSort, (dir: 'ASC' | 'DESC') => string> = {
	name: (d) => `lower(c.name) ${d}, c.id ${d}`,
	created: (d) => `c.created_at ${d}, c.id ${d}`,
	updated: (d) => `c.updated_at ${d}, c.id ${d}`
};

const MATCH = `(:q = '' OR c.name ILIKE :pattern OR c.account_number ILIKE :pattern
	OR EXISTS (SELECT 1 FROM sites s WHERE s.customer_id = c.id AND s.city ILIKE :pattern))`;

function toSiteRow(s: Site): SiteRow {
	return {
		id: s.id,
		customerId: s.customerId,
		name: s.name,
		addressLine1: s.addressLine1,
		addressLine2: s.addressLine2,
		city: s.city,
		postalCode: s.postalCode,
		country: s.country,
		regionCode: s.regionCode
	};
}

async function sitesOf(customerIds: string[]): Promise<Map<string, SiteRow[]>> {
	const bySite = new Map<string, SiteRow[]>(customerIds.map((id) => [id, []]));
	if (customerIds.length === 0) return bySite;
	const sites = await Site.findAll({
		where: { customerId: customerIds },
		order: [
			['name', 'ASC'],
			['id', 'ASC']
		]
	});
	for (const s of sites) bySite.get(s.customerId)?.push(toSiteRow(s));
	return bySite;
}

/**
 * One page of the customer list. `q` matches name, account number or a site's city
 * (case-insensitive, anywhere in the text). A page past the end shows the last page.
 */
export async function listCustomers(query: {
	q: string;
	sort: CustomerSort;
	dir: 'asc' | 'desc';
	page: number;
	pageSize?: number;
}): Promise<CustomerPage> {
	const pageSize = query.pageSize ?? CUSTOMERS_PER_PAGE;
	const replacements = { q: query.q, pattern: containsPattern(query.q) };
	const [{ total }] = await sequelize.query<{ total: string }>(`SELECT count(*) AS total FROM customers c WHERE ${MATCH}`, {
		replacements,
		type: QueryTypes.SELECT
	});
	const count = Number(total);
	const pageCount = Math.max(1, Math.ceil(count / pageSize));
	const page = Math.min(Math.max(1, query.page), pageCount);
	const rows = await sequelize.query<{
		id: string;
		name: string;
		account_number: string | null;
		owner_name: string | null;
		created_at: Date;
		updated_at: Date;
	}>(
		`SELECT c.id, c.name, c.account_number, u.name AS owner_name, c.created_at, c.updated_at
		 FROM customers c LEFT JOIN users u ON u.id = c.owner_id
		 WHERE ${MATCH}
		 ORDER BY ${ORDER[query.sort](query.dir === 'desc' ? 'DESC' : 'ASC')}
		 LIMIT :limit OFFSET :offset`,
		{ replacements: { ...replacements, limit: pageSize, offset: (page - 1) * pageSize }, type: QueryTypes.SELECT }
	);
	const sites = await sitesOf(rows.map((r) => r.id));
	return {
		rows: rows.map((r) => {
			const own = sites.get(r.id) ?? [];
			return {
				id: r.id,
				name: r.name,
				accountNumber: r.account_number,
				ownerName: r.owner_name,
				cities: [...new Set(own.map((s) => s.city))].sort((a, b) => a.localeCompare(b)),
				siteCount: own.length,
				createdAt: new Date(r.created_at).toISOString(),
				updatedAt: new Date(r.updated_at).toISOString()
			};
		}),
		total: count,
		page,
		pageCount,
		pageSize
	};
}

/** Customers with their sites for the survey wizard's picker, by name; `q` as in {@link listCustomers}. */
export async function searchCustomersForPicker(q: string, limit: number): Promise<PickerCustomer[]> {
	const rows = await sequelize.query<{ id: string; name: string; account_number: string | null }>(
		`SELECT c.id, c.name, c.account_number FROM customers c WHERE ${MATCH}
		 ORDER BY lower(c.name), c.id LIMIT :limit`,
		{ replacements: { q: q.trim(), pattern: containsPattern(q.trim()), limit }, type: QueryTypes.SELECT }
	);
	const sites = await sitesOf(rows.map((r) => r.id));
	return rows.map((r) => ({ id: r.id, name: r.name, accountNumber: r.account_number, sites: sites.get(r.id) ?? [] }));
}

export async function customerExists(id: string): Promise<boolean> {
	return (await Customer.count({ where: { id } })) > 0;
}

/** Just the name, for headings and breadcrumbs; null when there is no such customer. */
export async function customerName(id: string): Promise<string | null> {
	const c = await Customer.findByPk(id, { attributes: ['name'] });
	return c?.name ?? null;
}

/** A customer with its sites and contacts, or null. */
export async function getCustomer(id: string): Promise<CustomerDetail | null> {
	const c = await Customer.findByPk(id, { include: [{ model: User, as: 'owner', attributes: ['name'] }] });
	if (!c) return null;
	const [sites, contacts] = await Promise.all([
		sitesOf([id]),
		Contact.findAll({
			where: { customerId: id },
			order: [
				['name', 'ASC'],
				['id', 'ASC']
			]
		})
	]);
	const siteRows = sites.get(id) ?? [];
	const siteName = new Map(siteRows.map((s) => [s.id, s.name]));
	return {
		id: c.id,
		name: c.name,
		accountNumber: c.accountNumber,
		notes: c.notes,
		ownerId: c.ownerId,
		ownerName: (c as unknown as { owner?: User | null }).owner?.name ?? null,
		teamId: c.teamId,
		createdAt: c.createdAt.toISOString(),
		updatedAt: c.updatedAt.toISOString(),
		sites: siteRows,
		contacts: contacts.map((k) => ({
			id: k.id,
			customerId: k.customerId,
			siteId: k.siteId,
			siteName: k.siteId ? (siteName.get(k.siteId) ?? null) : null,
			name: k.name,
			roleTitle: k.roleTitle,
			email: k.email,
			phone: k.phone
		}))
	};
}

async function accountTaken(accountNumber: string | null, exceptId?: string): Promise<boolean> {
	if (!accountNumber) return false;
	const [row] = await sequelize.query<{ id: string }>(
		`SELECT id FROM customers WHERE lower(account_number) = lower(:accountNumber) AND (CAST(:exceptId AS uuid) IS NULL OR id <> CAST(:exceptId AS uuid)) LIMIT 1`,
		{ replacements: { accountNumber, exceptId: exceptId ?? null }, type: QueryTypes.SELECT }
	);
	return !!row;
}

function customerFields(input: CustomerInput) {
	return { name: input.name, accountNumber: input.accountNumber || null, notes: input.notes };
}

async function customerByToken(clientToken: string | null): Promise<string | null> {
	if (!clientToken) return null;
	return (await Customer.findOne({ where: { clientToken }, attributes: ['id'] }))?.id ?? null;
}

/**
 * Creates a customer owned by `owner` (the rep who enters it, and their team). With the form's
 * `clientToken`, sending the same form again (a double tap, a retry) answers the customer it made.
 */
export async function createCustomer(
	input: CustomerInput,
	owner: { id: string; teamId: string | null },
	clientToken: string | null = null
): Promise<SaveResult> {
	const fields = customerFields(input);
	// the same form sent before (or at the same moment): its customer, not a refusal of the
	// account number it just took
	const sameForm = async (): Promise<SaveResult> => {
		const made = await customerByToken(clientToken);
		return made ? { ok: true, id: made } : { ok: false, field: 'accountNumber', message: ACCOUNT_TAKEN };
	};
	const made = await customerByToken(clientToken);
	if (made) return { ok: true, id: made };
	if (await accountTaken(fields.accountNumber)) return sameForm();
	try {
		const c = await Customer.create({ ...fields, ownerId: owner.id, teamId: owner.teamId, clientToken });
		return { ok: true, id: c.id };
	} catch (err) {
		// the unique indexes (token, account number) decide between saves at the same moment
		if (err instanceof UniqueConstraintError) return sameForm();
		throw err;
	}
}

export async function updateCustomer(id: string, input: CustomerInput): Promise<SaveResult> {
	const fields = customerFields(input);
	if (await accountTaken(fields.accountNumber, id)) return { ok: false, field: 'accountNumber', message: ACCOUNT_TAKEN };
	try {
		const [count] = await Customer.update(fields, { where: { id } });
		return count > 0 ? { ok: true, id } : { ok: false, notFound: true };
	} catch (err) {
		if (err instanceof UniqueConstraintError) return { ok: false, field: 'accountNumber', message: ACCOUNT_TAKEN };
		throw err;
	}
}

/** A change to a site or contact is a change to the customer: the list's "updated" sort sees it. */
async function touchCustomer(customerId: string, transaction: Transaction): Promise<void> {
	await sequelize.query('UPDATE customers SET updated_at = now() WHERE id = :customerId', {
		replacements: { customerId },
		transaction
	});
}

/** Locks the customer row for the transaction; false when it does not exist. */
async function lockCustomer(customerId: string, transaction: Transaction): Promise<boolean> {
	return !!(await Customer.findByPk(customerId, { transaction, lock: transaction.LOCK.UPDATE, attributes: ['id'] }));
}

export async function getSite(customerId: string, siteId: string): Promise<SiteRow | null> {
	const s = await Site.findOne({ where: { id: siteId, customerId } });
	return s ? toSiteRow(s) : null;
}

export async function addSite(customerId: string, input: SiteInput): Promise<SaveResult> {
	return sequelize.transaction(async (transaction) => {
		if (!(await lockCustomer(customerId, transaction))) return { ok: false, notFound: true } as const;
		const s = await Site.create({ ...input, customerId }, { transaction });
		await touchCustomer(customerId, transaction);
		return { ok: true, id: s.id } as const;
	});
}

export async function updateSite(customerId: string, siteId: string, input: SiteInput): Promise<SaveResult> {
	return sequelize.transaction(async (transaction) => {
		const [count] = await Site.update(input, { where: { id: siteId, customerId }, transaction });
		if (count === 0) return { ok: false, notFound: true } as const;
		await touchCustomer(customerId, transaction);
		return { ok: true, id: siteId } as const;
	});
}

export async function getContact(customerId: string, contactId: string): Promise<ContactRow | null> {
	const k = await Contact.findOne({ where: { id: contactId, customerId }, include: [{ model: Site, as: 'site', attributes: ['name'] }] });
	if (!k) return null;
	return {
		id: k.id,
		customerId: k.customerId,
		siteId: k.siteId,
		siteName: (k as unknown as { site?: Site | null }).site?.name ?? null,
		name: k.name,
		roleTitle: k.roleTitle,
		email: k.email,
		phone: k.phone
	};
}

const NOT_THIS_CUSTOMERS_SITE = 'Choose one of this customer’s sites, or no particular site.';

function contactFields(input: ContactInput) {
	return {
		name: input.name,
		roleTitle: input.roleTitle,
		email: input.email.toLowerCase(),
		phone: input.phone,
		siteId: input.siteId || null
	};
}

async function siteBelongs(customerId: string, siteId: string | null, transaction: Transaction): Promise<boolean> {
	if (!siteId) return true;
	return (await Site.count({ where: { id: siteId, customerId }, transaction })) > 0;
}

export async function addContact(customerId: string, input: ContactInput): Promise<SaveResult> {
	const fields = contactFields(input);
	return sequelize.transaction(async (transaction) => {
		if (!(await lockCustomer(customerId, transaction))) return { ok: false, notFound: true } as const;
		if (!(await siteBelongs(customerId, fields.siteId, transaction))) {
			return { ok: false, field: 'siteId', message: NOT_THIS_CUSTOMERS_SITE } as const;
		}
		const k = await Contact.create({ ...fields, customerId }, { transaction });
		await touchCustomer(customerId, transaction);
		return { ok: true, id: k.id } as const;
	});
}

export async function updateContact(customerId: string, contactId: string, input: ContactInput): Promise<SaveResult> {
	const fields = contactFields(input);
	return sequelize.transaction(async (transaction) => {
		if (!(await siteBelongs(customerId, fields.siteId, transaction))) {
			return { ok: false, field: 'siteId', message: NOT_THIS_CUSTOMERS_SITE } as const;
		}
		const [count] = await Contact.update(fields, { where: { id: contactId, customerId }, transaction });
		if (count === 0) return { ok: false, notFound: true } as const;
		await touchCustomer(customerId, transaction);
		return { ok: true, id: contactId } as const;
	});
}
