import { QueryTypes, type Transaction } from 'sequelize';
import { sequelize } from '../db';
import { isBusyError } from '../db/bad-value';
import { recordScope, canSeeRecord } from '../auth/permissions';
import type { SessionUser } from '../auth/types';
import type { QuoteState } from '../quotes/states';
import type { QuoteTotals } from '../quotes/pricing';

/** One priced line as stored. Money in cents, discounts in basis points. */
export interface QuoteLineRow {
	id: string;
	position: number;
	sku: string;
	description: string;
	kind: string;
	quantity: number;
	unitListCents: number;
	unitCostCents: number;
	lineDiscountBp: number;
	noCharge: boolean;
	source: string;
	reason: string;
	inPriceBook: boolean;
}

export interface QuoteEventRow {
	action: string;
	fromState: string | null;
	toState: string;
	actorName: string | null;
	actorRole: string;
	comment: string | null;
	at: string;
	revision: number;
}

export interface RevisionRow {
	id: string;
	quoteId: string;
	revision: number;
	number: string;
	state: QuoteState;
	priceBookVersionId: string;
	priceBookLabel: string;
	setupId: string;
	setupName: string;
	engineResult: unknown;
	engineInput: unknown;
	overallDiscountBp: number;
	taxRegion: string | null;
	taxLabel: string | null;
	taxRateBp: number;
	depositShareBp: number;
	validityDays: number;
	terms: string;
	notes: string;
	contactName: string;
	contactEmail: string;
	totals: QuoteTotals;
	approvalRequired: boolean;
	approvalReasons: string[];
	validUntil: string | null;
	sentAt: string | null;
	hasPdf: boolean;
	pdfSha256: string | null;
	createdAt: string;
	updatedAt: string;
}

export interface QuoteView {
	id: string;
	surveyId: string;
	customerId: string;
	customerName: string;
	siteId: string | null;
	siteName: string | null;
	siteAddress: string[];
	siteRegion: string | null;
	ownerId: string;
	ownerName: string;
	ownerEmail: string;
	teamId: string | null;
	createdAt: string;
	revision: RevisionRow;
	lines: QuoteLineRow[];
	events: QuoteEventRow[];
	revisions: { id: string; revision: number; number: string; state: QuoteState }[];
}

const n = (v: unknown) => (v == null ? 0 : Number(v));
const iso = (v: unknown) => (v == null ? null : new Date(v as string).toISOString());

function revisionRow(r: Record<string, unknown>): RevisionRow {
	return {
		id: r.id as string,
		quoteId: r.quote_id as string,
		revision: n(r.revision),
		number: r.number as string,
		state: r.state as QuoteState,
		priceBookVersionId: r.price_book_version_id as string,
		priceBookLabel: (r.price_book_label as string) ?? '',
		setupId: r.setup_id as string,
		setupName: r.setup_name as string,
		engineResult: r.engine_result,
		engineInput: r.engine_input,
		overallDiscountBp: n(r.overall_discount_bp),
		taxRegion: (r.tax_region as string) ?? null,
		taxLabel: (r.tax_label as string) ?? null,
		taxRateBp: n(r.tax_rate_bp),
		depositShareBp: n(r.deposit_share_bp),
		validityDays: n(r.validity_days),
		terms: (r.terms as string) ?? '',
		notes: (r.notes as string) ?? '',
		contactName: (r.contact_name as string) ?? '',
		contactEmail: (r.contact_email as string) ?? '',
		totals: r.totals as QuoteTotals,
		approvalRequired: !!r.approval_required,
		approvalReasons: (r.approval_reasons as string[]) ?? [],
		validUntil: iso(r.valid_until),
		sentAt: iso(r.sent_at),
		hasPdf: !!r.has_pdf,
		pdfSha256: (r.pdf_sha256 as string) ?? null,
		createdAt: iso(r.created_at)!,
		updatedAt: iso(r.updated_at)!
	};
}

function lineRow(r: Record<string, unknown>): QuoteLineRow {
	return {
		id: r.id as string,
		position: n(r.position),
		sku: r.sku as string,
		description: r.description as string,
		kind: r.kind as string,
		quantity: n(r.quantity),
		unitListCents: n(r.unit_list_cents),
		unitCostCents: n(r.unit_cost_cents),
		lineDiscountBp: n(r.line_discount_bp),
		noCharge: !!r.no_charge,
		source: r.source as string,
		reason: (r.reason as string) ?? '',
		inPriceBook: !!r.in_price_book
	};
}

const REVISION_COLUMNS = `qr.id, qr.quote_id, qr.revision, qr.number, qr.state, qr.price_book_version_id, pbv.label AS price_book_label,
	qr.setup_id, qr.setup_name, qr.engine_result, qr.engine_input, qr.overall_discount_bp, qr.tax_region, qr.tax_label,
	qr.tax_rate_bp, qr.deposit_share_bp, qr.validity_days, qr.terms, qr.notes, qr.contact_name, qr.contact_email,
	qr.totals, qr.approval_required, qr.approval_reasons, qr.valid_until, qr.sent_at, (qr.pdf IS NOT NULL) AS has_pdf,
	qr.pdf_sha256, qr.created_at, qr.updated_at`;

/** How long a change waits in all for another change of the same quote to finish, ms. */
export const QUOTE_LOCK_WAIT_MS = 3_000;
/** How long one try waits for the quote's row lock, ms (see withQuoteLock). */
export const QUOTE_LOCK_TRY_MS = 100;

/**
 * Runs `work` in a transaction that locks a quote (getQuote with `lock: true`). While another change
 * holds the quote, each try gives up after QUOTE_LOCK_TRY_MS, hands its connection back to the pool,
 * pauses briefly and tries again, for up to QUOTE_LOCK_WAIT_MS in all; then the busy error goes to
 * the caller (a 409). Waiting without a connection matters: sixteen taps on one quote used to hold
 * sixteen pooled connections while they queued for its lock, and a request that found the pool
 * empty for 6 s was answered as if the database were down (503).
 */
export async function withQuoteLock<T>(work: (t: Transaction) => Promise<T>): Promise<T> {
	const deadline = Date.now() + QUOTE_LOCK_WAIT_MS;
	for (;;) {
		try {
			return await sequelize.transaction(work);
		} catch (err) {
			if (!isBusyError(err) || Date.now() >= deadline) throw err;
			await new Promise((resolve) => setTimeout(resolve, 50 + Math.random() * 100));
		}
	}
}

export type Access<T> = { ok: true; value: T } | { ok: false; status: 403 | 404 };

/**
 * A quote with one revision (the latest unless `revision` is given), its lines, its history and its
 * revision list: four queries whatever the number of lines; two with `history: false` (events and
 * revisions then come back empty: the customer's page shows neither).
 */
export async function getQuote(
	id: string,
	viewer: SessionUser | null,
	opts: { revision?: number; transaction?: Transaction; lock?: boolean; history?: boolean } = {}
): Promise<Access<QuoteView>> {
	const t = opts.transaction;
	const history = opts.history ?? true;
	// a quote held by another change: this try gives up quickly (withQuoteLock tries again) rather
	// than queueing up to the statement timeout
	if (opts.lock) await sequelize.query(`SET LOCAL lock_timeout = '${QUOTE_LOCK_TRY_MS}ms'`, { transaction: t });
	const rows = await sequelize.query<Record<string, unknown>>(
		`SELECT q.id AS q_id, q.survey_id, q.customer_id, c.name AS customer_name, q.site_id, st.name AS site_name,
		        st.address_line1, st.address_line2, st.city, st.postal_code, st.country, st.region_code,
		        q.owner_id, u.name AS owner_name, u.email AS owner_email, q.team_id, q.created_at AS q_created_at,
		        ${REVISION_COLUMNS}
		 FROM quotes q
		 JOIN customers c ON c.id = q.customer_id
		 LEFT JOIN sites st ON st.id = q.site_id
		 JOIN users u ON u.id = q.owner_id
		 JOIN quote_revisions qr ON qr.quote_id = q.id
		 JOIN price_book_versions pbv ON pbv.id = qr.price_book_version_id
		 WHERE q.id = :id AND (CAST(:rev AS integer) IS NULL AND qr.revision = (SELECT max(revision) FROM quote_revisions WHERE quote_id = q.id)
		                       OR qr.revision = CAST(:rev AS integer))
		 ${opts.lock ? 'FOR UPDATE OF qr' : ''}`,
		{ replacements: { id, rev: opts.revision ?? null }, type: QueryTypes.SELECT, transaction: t }
	);
	const r = rows[0];
	if (!r) return { ok: false, status: 404 };
	if (viewer && !canSeeRecord(viewer, { id: r.owner_id as string, teamId: (r.team_id as string) ?? null })) {
		return { ok: false, status: 403 };
	}
	const revision = revisionRow(r);
	// one connection runs one statement at a time: inside a transaction, run them in turn
	const run = <T>(fns: (() => Promise<T>)[]) => (t ? fns.reduce<Promise<T[]>>(async (acc, f) => [...(await acc), await f()], Promise.resolve([])) : Promise.all(fns.map((f) => f())));
	const [lines, events, revisions] = await run<Record<string, unknown>[]>([
		() => sequelize.query<Record<string, unknown>>(
			`SELECT * FROM quote_lines WHERE revision_id = :rid ORDER BY position`,
			{ replacements: { rid: revision.id }, type: QueryTypes.SELECT, transaction: t }
		),
		() => !history ? Promise.resolve([]) : sequelize.query<Record<string, unknown>>(
			`SELECT e.action, e.from_state, e.to_state, u.name AS actor_name, e.actor_role, e.comment, e.at, qr.revision
			 FROM quote_events e LEFT JOIN users u ON u.id = e.actor_id JOIN quote_revisions qr ON qr.id = e.revision_id
			 WHERE e.quote_id = :id ORDER BY e.at, e.id`,
			{ replacements: { id }, type: QueryTypes.SELECT, transaction: t }
		),
		() => !history ? Promise.resolve([]) : sequelize.query<Record<string, unknown>>(
			`SELECT id, revision, number, state FROM quote_revisions WHERE quote_id = :id ORDER BY revision`,
			{ replacements: { id }, type: QueryTypes.SELECT, transaction: t }
		)
	]);
	return {
		ok: true,
		value: {
			id: r.q_id as string,
			surveyId: r.survey_id as string,
			customerId: r.customer_id as string,
			customerName: r.customer_name as string,
			siteId: (r.site_id as string) ?? null,
			siteName: (r.site_name as string) ?? null,
			siteAddress: [
				r.address_line1,
				r.address_line2,
				[r.postal_code, r.city].filter(Boolean).join(' '),
				r.country
			].filter((x): x is string => typeof x === 'string' && x.trim() !== ''),
			siteRegion: (r.region_code as string) || null,
			ownerId: r.owner_id as string,
			ownerName: r.owner_name as string,
			ownerEmail: r.owner_email as string,
			teamId: (r.team_id as string) ?? null,
			createdAt: iso(r.q_created_at)!,
			revision,
			lines: lines.map(lineRow),
			events: events.map((e) => ({
				action: e.action as string,
				fromState: (e.from_state as string) ?? null,
				toState: e.to_state as string,
				actorName: (e.actor_name as string) ?? null,
				actorRole: e.actor_role as string,
				comment: (e.comment as string) ?? null,
				at: iso(e.at)!,
				revision: n(e.revision)
			})),
			revisions: revisions.map((v) => ({
				id: v.id as string,
				revision: n(v.revision),
				number: v.number as string,
				state: v.state as QuoteState
			}))
		}
	};
}

export interface NewLine {
	sku: string;
	description: string;
	kind: string;
	quantity: number;
	unitListCents: number;
	unitCostCents: number;
	lineDiscountBp: number;
	noCharge: boolean;
	source: string;
	reason: string;
	inPriceBook: boolean;
}

/** Inserts lines in one statement. */
export async function insertLines(revisionId: string, lines: NewLine[], t: Transaction): Promise<void> {
	if (lines.length === 0) return;
	await sequelize.query(
		`INSERT INTO quote_lines (revision_id, position, sku, description, kind, quantity, unit_list_cents, unit_cost_cents,
		                          line_discount_bp, no_charge, source, reason, in_price_book)
		 SELECT :rid, x.position, x.sku, x.description, x.kind, x.quantity, x.unit_list_cents, x.unit_cost_cents,
		        x.line_discount_bp, x.no_charge, x.source, x.reason, x.in_price_book
		 FROM jsonb_to_recordset(:lines::jsonb) AS x(position int, sku text, description text, kind text, quantity int,
		      unit_list_cents bigint, unit_cost_cents bigint, line_discount_bp int, no_charge boolean, source text,
		      reason text, in_price_book boolean)`,
		{
			replacements: {
				rid: revisionId,
				lines: JSON.stringify(
					lines.map((l, i) => ({
						position: i + 1,
						sku: l.sku,
						description: l.description,
						kind: l.kind,
						quantity: l.quantity,
						unit_list_cents: l.unitListCents,
						unit_cost_cents: l.unitCostCents,
						line_discount_bp: l.lineDiscountBp,
						no_charge: l.noCharge,
						source: l.source,
						reason: l.reason,
						in_price_book: l.inPriceBook
					}))
				)
			},
			transaction: t
		}
	);
}

export async function replaceLines(revisionId: string, lines: NewLine[], t: Transaction): Promise<void> {
	await sequelize.query(`DELETE FROM quote_lines WHERE revision_id = :rid`, { replacements: { rid: revisionId }, transaction: t });
	await insertLines(revisionId, lines, t);
}

export async function recordEvent(
	e: {
		quoteId: string;
		revisionId: string;
		action: string;
		fromState: string | null;
		toState: string;
		actorId: string | null;
		actorRole: string;
		comment: string | null;
	},
	t: Transaction
): Promise<void> {
	await sequelize.query(
		`INSERT INTO quote_events (quote_id, revision_id, action, from_state, to_state, actor_id, actor_role, comment)
		 VALUES (:quoteId, :revisionId, :action, :fromState, :toState, :actorId, :actorRole, :comment)`,
		{ replacements: e, transaction: t }
	);
}

/** Updates columns of one revision. Keys are column names; values are bound, never interpolated. */
export async function updateRevision(id: string, fields: Record<string, unknown>, t: Transaction): Promise<void> {
	const allowed = new Set([
		'state', 'overall_discount_bp', 'tax_region', 'tax_label', 'tax_rate_bp', 'notes', 'contact_name', 'contact_email',
		'totals', 'approval_required', 'approval_reasons', 'valid_until', 'sent_at', 'pdf', 'pdf_sha256', 'terms',
		'deposit_share_bp', 'validity_days'
	]);
	const keys = Object.keys(fields).filter((k) => allowed.has(k));
	if (keys.length === 0) return;
	const json = new Set(['totals', 'approval_reasons']);
	const sets = keys.map((k) => `${k} = :${k}${json.has(k) ? '::jsonb' : ''}`).join(', ');
	const replacements: Record<string, unknown> = { id };
	for (const k of keys) replacements[k] = json.has(k) ? JSON.stringify(fields[k]) : fields[k];
	await sequelize.query(`UPDATE quote_revisions SET ${sets}, updated_at = now() WHERE id = :id`, { replacements, transaction: t });
	await sequelize.query(`UPDATE quotes SET updated_at = now() WHERE id = (SELECT quote_id FROM quote_revisions WHERE id = :id)`, {
		replacements: { id },
		transaction: t
	});
}

export async function revisionPdf(revisionId: string): Promise<{ pdf: Buffer; sha256: string; number: string } | null> {
	const rows = await sequelize.query<{ pdf: Buffer | null; pdf_sha256: string | null; number: string }>(
		`SELECT pdf, pdf_sha256, number FROM quote_revisions WHERE id = :id`,
		{ replacements: { id: revisionId }, type: QueryTypes.SELECT }
	);
	const r = rows[0];
	return r?.pdf ? { pdf: r.pdf, sha256: r.pdf_sha256 ?? '', number: r.number } : null;
}

export interface QuoteListRow {
	id: string;
	number: string;
	state: QuoteState;
	customerName: string;
	ownerName: string;
	totalCents: number;
	depositCents: number;
	setupName: string;
	approvalRequired: boolean;
	updatedAt: string;
	createdAt: string;
}

export interface QuoteFilters {
	state?: string;
	owner?: string;
	customer?: string;
	/** one customer's quotes, by id */
	customerId?: string;
	from?: string;
	to?: string;
	sort?: 'updated' | 'created' | 'total' | 'customer' | 'number';
	dir?: 'asc' | 'desc';
	page?: number;
	pageSize?: number;
}

const SORTS: Record<NonNullable<QuoteFilters['sort']>, string> = {
	updated: 'q.updated_at',
	created: 'q.created_at',
	total: "(qr.totals->>'totalCents')::bigint",
	customer: 'lower(c.name)',
	number: 'qr.number'
};

/** The latest revision of each quote the viewer may see, filtered and sorted. */
export async function listQuotes(viewer: SessionUser, f: QuoteFilters = {}): Promise<{ rows: QuoteListRow[]; total: number }> {
	const where: string[] = ['qr.revision = (SELECT max(revision) FROM quote_revisions x WHERE x.quote_id = q.id)'];
	const rep: Record<string, unknown> = {};
	if (recordScope(viewer.role) === 'team') {
		where.push(viewer.teamId ? '(q.owner_id = :me OR q.team_id = :team)' : 'q.owner_id = :me');
		rep.me = viewer.id;
		rep.team = viewer.teamId;
	}
	if (f.state) {
		where.push('qr.state = :state');
		rep.state = f.state;
	}
	if (f.owner) {
		where.push('q.owner_id = :owner');
		rep.owner = f.owner;
	}
	if (f.customer) {
		where.push('c.name ILIKE :customer');
		rep.customer = `%${f.customer.replace(/[%_\\]/g, (m) => '\\' + m)}%`;
	}
	if (f.customerId) {
		where.push('q.customer_id = :customerId');
		rep.customerId = f.customerId;
	}
	if (f.from) {
		where.push('q.created_at >= :from::date');
		rep.from = f.from;
	}
	if (f.to) {
		where.push("q.created_at < (:to::date + interval '1 day')");
		rep.to = f.to;
	}
	const pageSize = f.pageSize ?? 25;
	rep.limit = pageSize;
	rep.offset = (Math.max(1, f.page ?? 1) - 1) * pageSize;
	const order = `${SORTS[f.sort ?? 'updated']} ${f.dir === 'asc' ? 'ASC' : 'DESC'}, q.id`;
	const rows = await sequelize.query<Record<string, unknown>>(
		`SELECT count(*) OVER () AS total, q.id, qr.number, qr.state, c.name AS customer_name, u.name AS owner_name,
		        qr.totals, qr.setup_name, qr.approval_required, q.updated_at, q.created_at
		 FROM quotes q JOIN quote_revisions qr ON qr.quote_id = q.id
		 JOIN customers c ON c.id = q.customer_id JOIN users u ON u.id = q.owner_id
		 WHERE ${where.join(' AND ')}
		 ORDER BY ${order} LIMIT :limit OFFSET :offset`,
		{ replacements: rep, type: QueryTypes.SELECT }
	);
	return {
		total: rows.length ? n(rows[0].total) : 0,
		rows: rows.map((r) => ({
			id: r.id as string,
			number: r.number as string,
			state: r.state as QuoteState,
			customerName: r.customer_name as string,
			ownerName: r.owner_name as string,
			totalCents: n((r.totals as QuoteTotals)?.totalCents),
			depositCents: n((r.totals as QuoteTotals)?.depositCents),
			setupName: r.setup_name as string,
			approvalRequired: !!r.approval_required,
			updatedAt: iso(r.updated_at)!,
			createdAt: iso(r.created_at)!
		}))
	};
}

export interface ApprovalQueueRow {
	id: string;
	number: string;
	customerName: string;
	setupName: string;
	ownerName: string;
	totalCents: number;
	effectiveDiscountBp: number;
	marginBp: number | null;
	/** why the figures need a manager, one sentence each (approval.ts) */
	approvalReasons: string[];
	/** when this revision was last submitted for approval */
	submittedAt: string;
}

/**
 * Quotes waiting for a manager, longest-waiting first, with the approval rule's reasons and when
 * each was submitted (one statement).
 */
export async function listAwaitingApproval(viewer: SessionUser, limit = 100): Promise<ApprovalQueueRow[]> {
	const where = ["qr.state = 'awaiting-approval'", 'qr.revision = (SELECT max(revision) FROM quote_revisions x WHERE x.quote_id = q.id)'];
	const rep: Record<string, unknown> = { limit };
	if (recordScope(viewer.role) === 'team') {
		where.push(viewer.teamId ? '(q.owner_id = :me OR q.team_id = :team)' : 'q.owner_id = :me');
		rep.me = viewer.id;
		rep.team = viewer.teamId;
	}
	const rows = await sequelize.query<Record<string, unknown>>(
		`SELECT q.id, qr.number, c.name AS customer_name, qr.setup_name, u.name AS owner_name, qr.totals, qr.approval_reasons,
		        coalesce(sub.at, qr.updated_at) AS submitted_at
		 FROM quotes q JOIN quote_revisions qr ON qr.quote_id = q.id
		 JOIN customers c ON c.id = q.customer_id JOIN users u ON u.id = q.owner_id
		 LEFT JOIN LATERAL (SELECT max(e.at) AS at FROM quote_events e WHERE e.quote_id = q.id AND e.revision_id = qr.id AND e.action = 'submit') sub ON true
		 WHERE ${where.join(' AND ')}
		 ORDER BY submitted_at ASC, q.id LIMIT :limit`,
		{ replacements: rep, type: QueryTypes.SELECT }
	);
	return rows.map((r) => {
		const t = (r.totals as Partial<QuoteTotals>) ?? {};
		return {
			id: r.id as string,
			number: r.number as string,
			customerName: r.customer_name as string,
			setupName: r.setup_name as string,
			ownerName: r.owner_name as string,
			totalCents: n(t.totalCents),
			effectiveDiscountBp: n(t.effectiveDiscountBp),
			marginBp: t.marginBp == null ? null : n(t.marginBp),
			approvalReasons: Array.isArray(r.approval_reasons) ? (r.approval_reasons as string[]) : [],
			submittedAt: iso(r.submitted_at)!
		};
	});
}

/** Figures for the manager's dashboard, in a few aggregate queries. */
export async function pipelineFigures(): Promise<{
	byState: { state: QuoteState; count: number; totalCents: number }[];
	wonCents: number;
	wonCount: number;
	decidedCount: number;
	depositsByMonth: { month: string; cents: number }[];
	awaitingApproval: number;
}> {
	const latest = `SELECT DISTINCT ON (quote_id) quote_id, state, totals FROM quote_revisions ORDER BY quote_id, revision DESC`;
	const [byState, deposits] = await Promise.all([
		sequelize.query<{ state: QuoteState; count: string; total: string }>(
			`SELECT state, count(*) AS count, coalesce(sum((totals->>'totalCents')::bigint), 0) AS total FROM (${latest}) l GROUP BY state`,
			{ type: QueryTypes.SELECT }
		),
		sequelize.query<{ month: string; cents: string }>(
			`SELECT to_char(date_trunc('month', e.at), 'YYYY-MM') AS month, sum((qr.totals->>'depositCents')::bigint) AS cents
			 FROM quote_events e JOIN quote_revisions qr ON qr.id = e.revision_id
			 WHERE e.to_state = 'deposit-paid' AND e.at > now() - interval '12 months'
			 GROUP BY 1 ORDER BY 1`,
			{ type: QueryTypes.SELECT }
		)
	]);
	const states = byState.map((s) => ({ state: s.state, count: n(s.count), totalCents: n(s.total) }));
	const won = states.filter((s) => s.state === 'accepted' || s.state === 'deposit-paid');
	const lost = states.filter((s) => s.state === 'expired');
	const wonCount = won.reduce((a, s) => a + s.count, 0);
	return {
		byState: states,
		wonCents: won.reduce((a, s) => a + s.totalCents, 0),
		wonCount,
		decidedCount: wonCount + lost.reduce((a, s) => a + s.count, 0),
		depositsByMonth: deposits.map((d) => ({ month: d.month, cents: n(d.cents) })),
		awaitingApproval: states.find((s) => s.state === 'awaiting-approval')?.count ?? 0
	};
}
