/**
 * Quote use cases: build a quote from a survey's chosen setup, edit a draft, and take an action
 * (submit, approve, send, revise, …). Each runs in one transaction; the decisions come from the pure
 * modules (pricing, approval, states), the storage from the repositories.
 */
import { createHash } from 'node:crypto';
import { QueryTypes, type Transaction } from 'sequelize';
import { sequelize } from '../db';
import { isBusyError } from '../db/bad-value';
import type { SessionUser } from '../auth/types';
import type { Permission } from '../auth/permissions';
import type { EvaluateResult, ResolvedInput, SetupResult, EquipmentKind } from '../rules/types';
import { getSurvey } from '../repositories/surveys';
import { getActivePriceBook, getCompanySettings, getLogo, priceItems, taxRateFor } from '../repositories/pricing';
import {
	getQuote,
	insertLines,
	recordEvent,
	replaceLines,
	updateRevision,
	type NewLine,
	type QuoteView,
	withQuoteLock
} from '../repositories/quotes';
import { priceQuote, type LineKind, type QuoteInput } from './pricing';
import { needsApproval } from './approval';
import { transition, type ActorRole, type QuoteAction } from './states';
import { formatQuoteNumber, validUntil } from './numbering';
import { buildQuotePdf, type PdfSettings } from '../pdf/quote-pdf';
import { readinessProblems, taxUndecided } from '../../quote-readiness';
import { notifyQuoteEvent, type QuoteEventNotice } from './notify';

export type Outcome<T = undefined> =
	| { ok: true; value: T }
	| {
			ok: false;
			status: 400 | 403 | 404 | 409;
			message: string;
			/** the edit field the refusal is about (`lines.3.sku`, `taxRegion`), for the form to mark */
			field?: string;
	  };

const SETUP_KINDS: ReadonlySet<EquipmentKind> = new Set([
	'side-door',
	'wide-door',
	'side-cover',
	'service-trolley',
	'latch-trolley',
	'retrofit-kit',
	'roller-bed',
	'latch-adapter'
]);

/** The price-book line kind of an engine bill-of-materials item. */
export function lineKindOf(kind: EquipmentKind): LineKind {
	if (kind === 'battery') return 'battery';
	if (kind === 'charger') return 'charger';
	return SETUP_KINDS.has(kind) ? 'setup' : 'accessory';
}

export const FREIGHT_SKU = 'TW-FREIGHT';
export const INSTALL_SKU = 'TW-INSTALL';

/** The quote's lines for a setup: trucks, their first batteries, the setup's bill of materials, freight and installation. */
export type SetupLine = Omit<NewLine, 'unitListCents' | 'unitCostCents' | 'inPriceBook' | 'noCharge'> & {
	/** the engine's catalogue price, used when the price book lacks the SKU */
	enginePriceCents: number;
};

/**
 * What each of two battery lines is for, added to its description when a setup adds batteries to
 * the ones in the trucks: both lines carry the same battery (same SKU, same price), and without
 * these words the customer reads the same item twice and suspects a double charge.
 */
export const BATTERY_IN_TRUCKS_NOTE = 'one fitted in each truck';
export const BATTERY_SPARES_NOTE = 'extra batteries for the exchange rotation';

/** `description` with what the battery line is for, when the quote also has the other battery line. */
export function batteryLineDescription(description: string, role: 'in-trucks' | 'spares'): string {
	return `${description} — ${role === 'in-trucks' ? BATTERY_IN_TRUCKS_NOTE : BATTERY_SPARES_NOTE}`;
}

export function linesForSetup(input: ResolvedInput, setup: SetupResult): SetupLine[] {
	const trucks = input.fleet.trucks;
	const lines: SetupLine[] = [
		{
			sku: input.truck.code ?? 'TRUCK',
			description: `${input.truck.name ?? 'Truck'} (${input.truck.voltage} V)`,
			kind: 'truck',
			quantity: trucks,
			lineDiscountBp: 0,
			source: 'truck',
			reason: 'The trucks surveyed.',
			enginePriceCents: 0
		},
		{
			sku: input.battery.sku ?? 'BATTERY-TO-SPEC',
			description: input.battery.name ?? `Battery ${input.battery.voltage} V ${input.battery.capacityAh} Ah ${input.battery.chemistry}`,
			kind: 'battery',
			quantity: trucks,
			lineDiscountBp: 0,
			source: 'truck',
			reason: 'One battery fitted in each truck.',
			enginePriceCents: 0
		}
	];
	for (const line of setup.bom) {
		lines.push({
			sku: line.sku ?? `ON-REQUEST-${line.kind}`,
			description: line.description,
			kind: lineKindOf(line.kind),
			quantity: line.quantity,
			lineDiscountBp: 0,
			source: 'bom',
			reason: line.reason,
			enginePriceCents: line.unitPriceCents
		});
	}
	lines.push(
		{ sku: FREIGHT_SKU, description: 'Freight to site', kind: 'freight', quantity: trucks, lineDiscountBp: 0, source: 'freight', reason: 'Delivery of trucks and equipment.', enginePriceCents: 0 },
		{ sku: INSTALL_SKU, description: 'Installation and handover', kind: 'installation', quantity: trucks, lineDiscountBp: 0, source: 'installation', reason: 'Setting up the handling gear and training the operators.', enginePriceCents: 0 }
	);
	return lines;
}

interface Policy {
	repDiscountAuthorityBp: number;
	marginFloorBp: number;
}

/** Prices the lines and applies the approval rule. */
export function figures(lines: NewLine[], rev: { overallDiscountBp: number; taxRateBp: number; depositShareBp: number }, policy: Policy) {
	const input: QuoteInput = {
		lines: lines.map((l) => ({
			sku: l.sku,
			description: l.description,
			quantity: l.quantity,
			unitListCents: l.unitListCents,
			unitCostCents: l.unitCostCents,
			lineDiscountBp: l.lineDiscountBp,
			kind: l.kind as LineKind,
			noCharge: l.noCharge
		})),
		overallDiscountBp: rev.overallDiscountBp,
		taxRateBp: rev.taxRateBp,
		depositShareBp: rev.depositShareBp
	};
	const priced = priceQuote(input);
	const approval = needsApproval(priced.totals, policy);
	return { priced, approval };
}

/**
 * Builds revision 1 of a quote from a survey whose setup is chosen, priced on the active price book.
 * A repeated `clientToken` (a double tap) returns the quote already made.
 */
export async function createQuoteFromSurvey(surveyId: string, user: SessionUser, clientToken: string | null): Promise<Outcome<string>> {
	const found = await getSurvey(surveyId, user);
	if (!found.ok) return { ok: false, status: found.status, message: found.status === 404 ? 'No such survey.' : 'This survey belongs to another team.' };
	const survey = found.value;
	if (!survey.chosenSetup || !survey.result || !survey.evaluatedInput) {
		return { ok: false, status: 409, message: 'Choose a setup on the recommendation screen before building a quote.' };
	}
	const result = survey.result as EvaluateResult;
	const input = survey.evaluatedInput as ResolvedInput;
	const setup = result.setups.find((s) => s.id === survey.chosenSetup);
	if (!setup) return { ok: false, status: 409, message: 'The chosen setup is missing from the stored answer; choose it again.' };

	const [book, settings] = await Promise.all([getActivePriceBook(), getCompanySettings()]);
	if (!book) return { ok: false, status: 409, message: 'No price book is active. An admin must publish one first.' };

	const sites = await sequelize.query<{ region_code: string }>(`SELECT region_code FROM sites WHERE id = :id`, {
		replacements: { id: survey.siteId },
		type: QueryTypes.SELECT
	});
	const siteRegion = sites[0]?.region_code?.trim() || null;
	const tax = siteRegion ? await taxRateFor(siteRegion) : null;
	// the rate's own code when one is found; a region with no rate stays on the quote, undecided,
	// until the rep picks a rate or "No tax / exempt" (quote-readiness.ts)
	const region = tax?.regionCode ?? siteRegion;

	const draftLines = linesForSetup(input, setup);
	const prices = await priceItems(book.id, draftLines.map((l) => l.sku));
	// the batteries in the trucks and the setup's extra batteries are two lines of one battery
	const hasSpares = draftLines.some((l) => l.source === 'bom' && l.kind === 'battery');
	const lines: NewLine[] = draftLines
		.map((l) => {
			const p = prices.get(l.sku);
			const list = p ? p.listCents : l.enginePriceCents;
			const description = p?.description && l.source !== 'bom' ? p.description : l.description;
			const batteryRole = !hasSpares || l.kind !== 'battery' ? null : l.source === 'bom' ? 'spares' : l.source === 'truck' ? 'in-trucks' : null;
			return {
				sku: l.sku,
				description: batteryRole ? batteryLineDescription(description, batteryRole) : description,
				kind: l.kind,
				quantity: l.quantity,
				unitListCents: list,
				unitCostCents: p ? p.costCents : 0,
				lineDiscountBp: 0,
				noCharge: list === 0,
				source: l.source,
				reason: l.reason,
				inPriceBook: !!p
			};
		})
		// freight and installation appear only when the price book carries them
		.filter((l) => l.inPriceBook || (l.source !== 'freight' && l.source !== 'installation'));

	const contact = (survey.data.site ?? {}) as { contactName?: string; contactEmail?: string };
	const revFigures = { overallDiscountBp: 0, taxRateBp: tax?.rateBp ?? 0, depositShareBp: settings.depositShareBp };
	const { priced, approval } = figures(lines, revFigures, settings);

	return sequelize.transaction(async (t) => {
		if (clientToken) {
			const existing = await sequelize.query<{ id: string }>(`SELECT id FROM quotes WHERE client_token = :token`, {
				replacements: { token: clientToken },
				type: QueryTypes.SELECT,
				transaction: t
			});
			if (existing[0]) return { ok: true as const, value: existing[0].id };
		}
		const year = new Date().getUTCFullYear();
		const [q] = (await sequelize.query(
			`INSERT INTO quotes (year, sequence, survey_id, customer_id, site_id, owner_id, team_id, client_token)
			 VALUES (:year, nextval('quote_sequence'), :surveyId, :customerId, :siteId, :ownerId, :teamId, :clientToken)
			 ON CONFLICT (client_token) DO NOTHING
			 RETURNING id, sequence`,
			{
				replacements: {
					year,
					surveyId,
					customerId: survey.customerId,
					siteId: survey.siteId,
					ownerId: user.id,
					teamId: user.teamId,
					clientToken
				},
				transaction: t
			}
		)) as [{ id: string; sequence: string }[], unknown];
		if (!q[0]) {
			// the same form arrived twice at once: the other request made it
			const again = await sequelize.query<{ id: string }>(`SELECT id FROM quotes WHERE client_token = :token`, {
				replacements: { token: clientToken },
				type: QueryTypes.SELECT,
				transaction: t
			});
			return { ok: true as const, value: again[0].id };
		}
		const quoteId = q[0].id;
		const number = formatQuoteNumber({ year, sequence: Number(q[0].sequence), revision: 1 });
		const [rev] = (await sequelize.query(
			`INSERT INTO quote_revisions (quote_id, revision, number, state, price_book_version_id, setup_id, setup_name, engine_result,
			   engine_input, overall_discount_bp, tax_region, tax_label, tax_rate_bp, deposit_share_bp, validity_days, terms,
			   contact_name, contact_email, totals, approval_required, approval_reasons, created_by)
			 VALUES (:quoteId, 1, :number, 'draft', :bookId, :setupId, :setupName, :result::jsonb, :input::jsonb, 0, :region, :taxLabel,
			   :taxRateBp, :depositShareBp, :validityDays, :terms, :contactName, :contactEmail, :totals::jsonb, :approvalRequired,
			   :approvalReasons::jsonb, :userId)
			 RETURNING id`,
			{
				replacements: {
					quoteId,
					number,
					bookId: book.id,
					setupId: setup.id,
					setupName: setup.name,
					result: JSON.stringify(result),
					input: JSON.stringify(input),
					region,
					taxLabel: tax?.label ?? null,
					taxRateBp: tax?.rateBp ?? 0,
					depositShareBp: settings.depositShareBp,
					validityDays: settings.quoteValidityDays,
					terms: settings.termsText ?? '',
					contactName: contact.contactName ?? '',
					contactEmail: contact.contactEmail ?? '',
					totals: JSON.stringify(priced.totals),
					approvalRequired: approval.required,
					approvalReasons: JSON.stringify(approval.reasons),
					userId: user.id
				},
				transaction: t
			}
		)) as [{ id: string }[], unknown];
		await insertLines(rev[0].id, lines, t);
		await recordEvent(
			{ quoteId, revisionId: rev[0].id, action: 'create', fromState: null, toState: 'draft', actorId: user.id, actorRole: user.role, comment: `Built from the survey with ${setup.name}.` },
			t
		);
		return { ok: true as const, value: quoteId };
	});
}

export interface DraftEdit {
	overallDiscountBp: number;
	taxRegion: string | null;
	notes: string;
	contactName: string;
	contactEmail: string;
	lines: { sku: string; quantity: number; lineDiscountBp: number }[];
}

/**
 * The lines of an edit, priced from the quote's own price-book version (never from the browser).
 * A SKU that is neither on the quote nor in its price book is refused.
 *
 * Each edited line keeps the description, kind and reason of the quote line it edits: the line at
 * the same position when it has the same SKU, else the first line with that SKU not yet taken. One
 * SKU may be on two lines (the batteries in the trucks and the extra ones), each with its own words.
 */
export async function linesFromEdit(
	q: QuoteView,
	edits: DraftEdit['lines']
): Promise<{ ok: true; value: NewLine[] } | { ok: false; status: 400; message: string; field: string }> {
	const prices = await priceItems(q.revision.priceBookVersionId, edits.map((l) => l.sku));
	const taken = new Set<number>();
	const match = (sku: string, i: number) => {
		let at = q.lines[i]?.sku === sku && !taken.has(i) ? i : q.lines.findIndex((l, j) => l.sku === sku && !taken.has(j));
		if (at < 0) at = q.lines.findIndex((l) => l.sku === sku);
		if (at < 0) return undefined;
		taken.add(at);
		return q.lines[at];
	};
	const lines: NewLine[] = [];
	for (const [i, l] of edits.entries()) {
		const known = match(l.sku, i);
		const p = prices.get(l.sku);
		if (!known && !p) {
			return { ok: false, status: 400, message: `Line ${i + 1}: “${l.sku}” is not in this quote's price book.`, field: `lines.${i}.sku` };
		}
		const unitList = p ? p.listCents : known!.unitListCents;
		lines.push({
			sku: l.sku,
			description: known?.description ?? p!.description,
			kind: known?.kind ?? p!.kind,
			quantity: l.quantity,
			unitListCents: unitList,
			unitCostCents: p ? p.costCents : known!.unitCostCents,
			lineDiscountBp: unitList === 0 ? 0 : l.lineDiscountBp,
			noCharge: unitList === 0,
			source: known?.source ?? 'accessory',
			reason: known?.reason ?? 'Added by the rep.',
			inPriceBook: !!p
		});
	}
	return { ok: true, value: lines };
}

/** Which permission each staff action needs (the states module then decides on the quote itself). */
export const ACTION_PERMISSION = {
	submit: 'quote:submit',
	'mark-ready': 'quote:submit',
	approve: 'quote:approve',
	'request-changes': 'quote:approve',
	send: 'quote:send',
	revise: 'quote:edit'
} as const satisfies Record<string, Permission>;

/**
 * Saves a draft's lines, discounts, tax region and notes. Prices always come from the quote's own
 * price-book version (never from the browser); unknown SKUs are refused.
 */
export async function saveDraft(quoteId: string, user: SessionUser, edit: DraftEdit): Promise<Outcome<QuoteView>> {
	const settings = await getCompanySettings();
	return withQuoteLock(async (t) => {
		const found = await getQuote(quoteId, user, { transaction: t, lock: true });
		if (!found.ok) return { ok: false, status: found.status, message: found.status === 404 ? 'No such quote.' : 'This quote belongs to another team.' };
		const q = found.value;
		if (q.revision.state !== 'draft' && q.revision.state !== 'changes-requested') {
			return { ok: false, status: 409, message: `A quote that is ${q.revision.state} cannot be edited. Revise it to make a new revision.` };
		}
		const edited = await linesFromEdit(q, edit.lines);
		if (!edited.ok) return edited;
		const lines = edited.value;
		let taxRateBp = q.revision.taxRateBp;
		let taxLabel = q.revision.taxLabel;
		if (edit.taxRegion !== q.revision.taxRegion) {
			const tax = edit.taxRegion ? await taxRateFor(edit.taxRegion) : null;
			if (edit.taxRegion && !tax) {
				return { ok: false, status: 400, message: `No tax rate is set up for region “${edit.taxRegion}”: choose one from the list, or “No tax / exempt”.`, field: 'taxRegion' };
			}
			taxRateBp = tax?.rateBp ?? 0;
			taxLabel = tax?.label ?? null;
		} else if (edit.taxRegion && taxUndecided(q.revision)) {
			// still the site's region without a rate: it stays undecided unless a rate was added since
			const tax = await taxRateFor(edit.taxRegion);
			if (tax) {
				taxRateBp = tax.rateBp;
				taxLabel = tax.label;
			}
		}
		const { priced, approval } = figures(lines, { overallDiscountBp: edit.overallDiscountBp, taxRateBp, depositShareBp: q.revision.depositShareBp }, settings);
		await replaceLines(q.revision.id, lines, t);
		await updateRevision(
			q.revision.id,
			{
				overall_discount_bp: edit.overallDiscountBp,
				tax_region: edit.taxRegion,
				tax_label: taxLabel,
				tax_rate_bp: taxRateBp,
				notes: edit.notes,
				contact_name: edit.contactName,
				contact_email: edit.contactEmail,
				totals: priced.totals,
				approval_required: approval.required,
				approval_reasons: approval.reasons
			},
			t
		);
		const again = await getQuote(quoteId, user, { transaction: t });
		return again.ok ? { ok: true, value: again.value } : { ok: false, status: 404, message: 'No such quote.' };
	});
}

const FAR_FUTURE = new Date('9999-12-31T23:59:59Z');

/** The dealer block of the PDF, from the company settings. */
export async function pdfSettings(): Promise<PdfSettings> {
	const [s, logo] = await Promise.all([getCompanySettings(), getLogo()]);
	return {
		dealerName: s.dealerName,
		dealerAddress: s.address,
		dealerPhone: s.phone,
		dealerEmail: s.email,
		logo,
		currency: s.currency,
		timeZone: s.timeZone
	};
}

/**
 * Takes one action on the quote's latest revision, for a staff member, the customer or the system.
 * The states module decides; this stores the new state and the event, builds and stores the PDF on
 * send, and starts revision n + 1 on revise — all in one transaction.
 */
export async function act(
	quoteId: string,
	actor: { user: SessionUser | null; role: ActorRole },
	action: QuoteAction,
	opts: {
		comment?: string;
		now?: Date;
		transaction?: Transaction;
		revisionId?: string;
		/** details the notice needs: the customer's typed name, the payment reference */
		notice?: Pick<QuoteEventNotice, 'acceptedByName' | 'paymentReference' | 'amountCents'>;
	} = {}
): Promise<Outcome<{ state: string; revisionId: string; changed: boolean }>> {
	const now = opts.now ?? new Date();
	const run = async (t: Transaction): Promise<Outcome<{ state: string; revisionId: string; changed: boolean }>> => {
		const found = await getQuote(quoteId, actor.user, { transaction: t, lock: true });
		if (!found.ok) return { ok: false, status: found.status, message: found.status === 404 ? 'No such quote.' : 'This quote belongs to another team.' };
		const q = found.value;
		const rev = q.revision;
		if (opts.revisionId && opts.revisionId !== rev.id) {
			return { ok: false, status: 409, message: 'A newer revision of this quote exists.' };
		}
		const decision = transition(rev.state, action, { role: actor.role }, {
			approvalRequired: rev.approvalRequired,
			now,
			validUntil: rev.validUntil ? new Date(rev.validUntil) : FAR_FUTURE,
			comment: opts.comment,
			// a quote leaves the rep's hands only with a contact, a valid address and a tax decision
			missing: action === 'submit' || action === 'mark-ready' ? readinessProblems(rev).map((p) => p.message) : undefined
		});
		if (!decision.ok) return { ok: false, status: 409, message: decision.message };
		if (!decision.record) return { ok: true, value: { state: rev.state, revisionId: rev.id, changed: false } };

		const event = {
			quoteId,
			revisionId: rev.id,
			action,
			fromState: decision.record.from,
			toState: decision.record.to,
			actorId: actor.user?.id ?? null,
			actorRole: actor.role,
			comment: decision.record.comment
		};

		if (decision.startsNewRevision) {
			await updateRevision(rev.id, { state: 'superseded' }, t);
			await recordEvent({ ...event, toState: 'superseded' }, t);
			const seq = await sequelize.query<{ year: number; sequence: string }>(`SELECT year, sequence FROM quotes WHERE id = :id`, {
				replacements: { id: quoteId },
				type: QueryTypes.SELECT,
				transaction: t
			});
			const number = formatQuoteNumber({ year: seq[0].year, sequence: Number(seq[0].sequence), revision: rev.revision + 1 });
			const [inserted] = (await sequelize.query(
				`INSERT INTO quote_revisions (quote_id, revision, number, state, price_book_version_id, setup_id, setup_name, engine_result,
				   engine_input, overall_discount_bp, tax_region, tax_label, tax_rate_bp, deposit_share_bp, validity_days, terms, notes,
				   contact_name, contact_email, totals, approval_required, approval_reasons, created_by)
				 SELECT quote_id, revision + 1, :number, 'draft', price_book_version_id, setup_id, setup_name, engine_result, engine_input,
				   overall_discount_bp, tax_region, tax_label, tax_rate_bp, deposit_share_bp, validity_days, terms, notes, contact_name,
				   contact_email, totals, approval_required, approval_reasons, :userId
				 FROM quote_revisions WHERE id = :id
				 RETURNING id`,
				{ replacements: { number, id: rev.id, userId: actor.user?.id ?? q.ownerId }, transaction: t }
			)) as [{ id: string }[], unknown];
			const newId = inserted[0].id;
			await sequelize.query(
				`INSERT INTO quote_lines (revision_id, position, sku, description, kind, quantity, unit_list_cents, unit_cost_cents,
				   line_discount_bp, no_charge, source, reason, in_price_book)
				 SELECT :newId, position, sku, description, kind, quantity, unit_list_cents, unit_cost_cents, line_discount_bp, no_charge,
				   source, reason, in_price_book FROM quote_lines WHERE revision_id = :id`,
				{ replacements: { newId, id: rev.id }, transaction: t }
			);
			await recordEvent({ ...event, revisionId: newId, action: 'create', fromState: null, toState: 'draft', comment: `Revision ${rev.revision + 1} started from ${rev.number}.` }, t);
			return { ok: true, value: { state: 'draft', revisionId: newId, changed: true } };
		}

		const fields: Record<string, unknown> = { state: decision.to };
		const extra: Partial<QuoteEventNotice> = { ...opts.notice };
		if (action === 'send') {
			if (!rev.contactEmail) {
				return { ok: false, status: 409, message: "Add the customer contact's e-mail address before sending: the quote goes there." };
			}
			const settings = await getCompanySettings();
			const until = validUntil(now, rev.validityDays, settings.timeZone ?? 'UTC');
			const sentView: QuoteView = { ...q, revision: { ...rev, state: 'sent', sentAt: now.toISOString(), validUntil: until.toISOString() } };
			const pdf = await buildQuotePdf(sentView, await pdfSettings());
			fields.sent_at = now;
			fields.valid_until = until;
			fields.pdf = pdf;
			fields.pdf_sha256 = createHash('sha256').update(pdf).digest('hex');
			extra.pdf = pdf;
			extra.validUntil = until;
		}
		await updateRevision(rev.id, fields, t);
		await recordEvent(event, t);
		await notifyQuoteEvent({ quote: q, action, to: decision.to, comment: decision.record.comment, actor: actor.user, now, ...extra }, t);
		return { ok: true, value: { state: decision.to, revisionId: rev.id, changed: true } };
	};
	if (opts.transaction) return run(opts.transaction);
	try {
		// two people acting on one quote at once: the second waits a moment for the quote's lock
		// (withQuoteLock: up to QUOTE_LOCK_WAIT_MS, without holding a connection), then is told so
		return await withQuoteLock(run);
	} catch (err) {
		if (isBusyError(err)) {
			return { ok: false, status: 409, message: 'Someone else is changing this quote right now. Try again in a moment.' };
		}
		throw err;
	}
}
