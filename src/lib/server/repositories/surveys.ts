import { QueryTypes, type Transaction } from 'sequelize';
import { sequelize } from '../db';
import { Survey } from '../db/models/surveys';
import { canSeeRecord, recordScope } from '../auth/permissions';
import type { SessionUser } from '../auth/types';
import type { DataStep, SurveyData } from '$lib/schemas/survey';

export interface SurveySummary {
	id: string;
	customerId: string;
	customerName: string;
	siteName: string | null;
	siteCity: string | null;
	ownerName: string;
	status: 'draft' | 'complete';
	currentStep: string;
	chosenSetup: string | null;
	updatedAt: string;
}

export interface SurveyView extends SurveySummary {
	siteId: string | null;
	ownerId: string;
	teamId: string | null;
	data: SurveyData;
	version: number;
	result: unknown | null;
	evaluatedInput: unknown | null;
	chosenAt: string | null;
	createdAt: string;
}

type Row = {
	id: string;
	customer_id: string;
	customer_name: string;
	site_id: string | null;
	site_name: string | null;
	site_city: string | null;
	owner_id: string;
	owner_name: string;
	team_id: string | null;
	status: 'draft' | 'complete';
	current_step: string;
	chosen_setup: string | null;
	data: SurveyData;
	version: number;
	result: unknown | null;
	evaluated_input: unknown | null;
	chosen_at: Date | null;
	created_at: Date;
	updated_at: Date;
};

const SELECT = `
	SELECT s.id, s.customer_id, c.name AS customer_name, s.site_id, st.name AS site_name, st.city AS site_city,
	       s.owner_id, u.name AS owner_name, s.team_id, s.status, s.current_step, s.chosen_setup,
	       s.data, s.version, s.result, s.evaluated_input, s.chosen_at, s.created_at, s.updated_at
	FROM surveys s
	JOIN customers c ON c.id = s.customer_id
	LEFT JOIN sites st ON st.id = s.site_id
	JOIN users u ON u.id = s.owner_id`;

function summary(r: Row): SurveySummary {
	return {
		id: r.id,
		customerId: r.customer_id,
		customerName: r.customer_name,
		siteName: r.site_name,
		siteCity: r.site_city,
		ownerName: r.owner_name,
		status: r.status,
		currentStep: r.current_step,
		chosenSetup: r.chosen_setup,
		updatedAt: new Date(r.updated_at).toISOString()
	};
}

function view(r: Row): SurveyView {
	return {
		...summary(r),
		siteId: r.site_id,
		ownerId: r.owner_id,
		teamId: r.team_id,
		data: r.data ?? {},
		version: r.version,
		result: r.result,
		evaluatedInput: r.evaluated_input,
		chosenAt: r.chosen_at ? new Date(r.chosen_at).toISOString() : null,
		createdAt: new Date(r.created_at).toISOString()
	};
}

/**
 * Starts a survey for a customer. `clientToken` comes from the form: the same token twice (a
 * double tap) returns the first survey instead of making a second.
 */
export async function createSurvey(input: {
	customerId: string;
	siteId: string | null;
	owner: SessionUser;
	clientToken: string | null;
	today: string;
}): Promise<string> {
	const [rows] = (await sequelize.query(
		`INSERT INTO surveys (customer_id, site_id, owner_id, team_id, client_token, data)
		 VALUES (:customerId, :siteId, :ownerId, :teamId, :clientToken, :data::jsonb)
		 ON CONFLICT (client_token) DO UPDATE SET client_token = EXCLUDED.client_token
		 RETURNING id`,
		{
			replacements: {
				customerId: input.customerId,
				siteId: input.siteId,
				ownerId: input.owner.id,
				teamId: input.owner.teamId,
				clientToken: input.clientToken,
				data: JSON.stringify({
					site: { customerId: input.customerId, siteId: input.siteId ?? undefined, surveyDate: input.today }
				})
			}
		}
	)) as [{ id: string }[], unknown];
	return rows[0].id;
}

/** Surveys the viewer may see (own and team's for a rep, all for managers and admins), newest first. */
export async function listSurveys(
	viewer: SessionUser,
	opts: { q?: string; customerId?: string; page?: number; pageSize?: number } = {}
): Promise<{ rows: SurveySummary[]; total: number }> {
	const pageSize = opts.pageSize ?? 25;
	const page = Math.max(1, opts.page ?? 1);
	const where: string[] = [];
	const replacements: Record<string, unknown> = { limit: pageSize, offset: (page - 1) * pageSize };
	if (recordScope(viewer.role) === 'team') {
		where.push(viewer.teamId ? '(s.owner_id = :me OR s.team_id = :team)' : 's.owner_id = :me');
		replacements.me = viewer.id;
		replacements.team = viewer.teamId;
	}
	if (opts.customerId) {
		where.push('s.customer_id = :customerId');
		replacements.customerId = opts.customerId;
	}
	if (opts.q) {
		where.push('(c.name ILIKE :q OR st.name ILIKE :q OR st.city ILIKE :q)');
		replacements.q = `%${opts.q.replace(/[%_\\]/g, (m) => '\\' + m)}%`;
	}
	const clause = where.length ? `WHERE ${where.join(' AND ')}` : '';
	const rows = await sequelize.query<Row & { total: string }>(
		`${SELECT.replace('SELECT s.id', 'SELECT count(*) OVER () AS total, s.id')} ${clause}
		 ORDER BY s.updated_at DESC LIMIT :limit OFFSET :offset`,
		{ replacements, type: QueryTypes.SELECT }
	);
	return { rows: rows.map(summary), total: rows.length ? Number(rows[0].total) : 0 };
}

export type Access<T> = { ok: true; value: T } | { ok: false; status: 403 | 404 };

/** One survey if the viewer may see it. */
export async function getSurvey(id: string, viewer: SessionUser): Promise<Access<SurveyView>> {
	const rows = await sequelize.query<Row>(`${SELECT} WHERE s.id = :id`, {
		replacements: { id },
		type: QueryTypes.SELECT
	});
	const row = rows[0];
	if (!row) return { ok: false, status: 404 };
	if (!canSeeRecord(viewer, { id: row.owner_id, teamId: row.team_id })) return { ok: false, status: 403 };
	return { ok: true, value: view(row) };
}

/**
 * Merges one step's values into the survey in a single statement (no read-modify-write race), bumps
 * the version and remembers the step. Returns the new version.
 */
const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

export async function saveStep(
	id: string,
	step: DataStep,
	values: Record<string, unknown>,
	opts: { currentStep?: string; transaction?: Transaction } = {}
): Promise<{ version: number; updatedAt: string }> {
	// the site chosen on the site step becomes the survey's site (lists, header, quote), if it is one of the customer's
	const siteId = step === 'site' && typeof values.siteId === 'string' && UUID.test(values.siteId) ? values.siteId : null;
	const [rows] = (await sequelize.query(
		`UPDATE surveys
		 SET data = jsonb_set(data, ARRAY[:step], coalesce(data -> :step, '{}'::jsonb) || :values::jsonb),
		     version = version + 1,
		     current_step = coalesce(:currentStep, current_step),
		     site_id = coalesce((SELECT st.id FROM sites st WHERE st.id = CAST(:siteId AS uuid) AND st.customer_id = surveys.customer_id), site_id),
		     updated_at = now()
		 WHERE id = :id
		 RETURNING version, updated_at`,
		{
			replacements: { id, step, values: JSON.stringify(values), currentStep: opts.currentStep ?? null, siteId },
			transaction: opts.transaction
		}
	)) as [{ version: number; updated_at: Date }[], unknown];
	if (!rows[0]) throw new Error('survey vanished');
	return { version: rows[0].version, updatedAt: new Date(rows[0].updated_at).toISOString() };
}

export async function setCurrentStep(id: string, step: string): Promise<void> {
	await Survey.update({ currentStep: step }, { where: { id } });
}

/** Stores the rep's chosen setup with the engine's full answer and the input it was given. */
export async function chooseSetup(
	id: string,
	user: SessionUser,
	setup: string,
	result: unknown,
	input: unknown
): Promise<void> {
	await Survey.update(
		{
			chosenSetup: setup,
			result: result as Record<string, unknown>,
			evaluatedInput: input as Record<string, unknown>,
			chosenAt: new Date(),
			chosenBy: user.id,
			status: 'complete'
		},
		{ where: { id } }
	);
}

export interface CustomerChoice {
	id: string;
	name: string;
	sites: { id: string; name: string; city: string | null }[];
}

/** Customers with their sites, for starting a survey (one query). */
export async function customerChoices(): Promise<CustomerChoice[]> {
	const rows = await sequelize.query<{ id: string; name: string; site_id: string | null; site_name: string | null; city: string | null }>(
		`SELECT c.id, c.name, st.id AS site_id, st.name AS site_name, st.city
		 FROM customers c LEFT JOIN sites st ON st.customer_id = c.id
		 ORDER BY c.name, st.name`,
		{ type: QueryTypes.SELECT }
	);
	const byId = new Map<string, CustomerChoice>();
	for (const r of rows) {
		let c = byId.get(r.id);
		if (!c) byId.set(r.id, (c = { id: r.id, name: r.name, sites: [] }));
		if (r.site_id) c.sites.push({ id: r.site_id, name: r.site_name ?? '', city: r.city });
	}
	return [...byId.values()];
}

/** The sites of one customer, for a survey's site step. */
export async function sitesOfCustomer(customerId: string): Promise<CustomerChoice['sites']> {
	const rows = await sequelize.query<{ id: string; name: string; city: string | null }>(
		`SELECT id, name, city FROM sites WHERE customer_id = :customerId ORDER BY name`,
		{ replacements: { customerId }, type: QueryTypes.SELECT }
	);
	return rows.map((r) => ({ id: r.id, name: r.name ?? '', city: r.city }));
}

export async function siteBelongsToCustomer(siteId: string, customerId: string): Promise<boolean> {
	const rows = await sequelize.query(`SELECT 1 FROM sites WHERE id = :siteId AND customer_id = :customerId`, {
		replacements: { siteId, customerId },
		type: QueryTypes.SELECT
	});
	return rows.length > 0;
}

/** The customer's contacts (name, e-mail, phone), for the site step's suggestions. */
export async function contactsOfCustomer(customerId: string): Promise<{ name: string; email: string; phone: string }[]> {
	return sequelize.query<{ name: string; email: string; phone: string }>(
		`SELECT name, email, phone FROM contacts WHERE customer_id = :customerId ORDER BY name LIMIT 50`,
		{ replacements: { customerId }, type: QueryTypes.SELECT }
	);
}
