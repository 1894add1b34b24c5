import { createHash, randomBytes } from 'node:crypto';
import { QueryTypes, type Transaction } from 'sequelize';
import { sequelize } from '../db';
import { config } from '../config';

/** 32 random bytes (256 bits), URL-safe; only its SHA-256 is stored. */
export function newToken(): string {
	return randomBytes(32).toString('base64url');
}

export function tokenHash(token: string): string {
	return createHash('sha256').update(token).digest('hex');
}

export function customerUrl(token: string): string {
	return `${config.publicUrl.replace(/\/$/, '')}/q/${token}`;
}

/** Makes a private link for one quote revision, valid until `expiresAt`. */
export async function createLink(quoteId: string, revisionId: string, expiresAt: Date, t?: Transaction): Promise<string> {
	const token = newToken();
	await sequelize.query(
		`INSERT INTO quote_links (quote_id, revision_id, token_hash, expires_at) VALUES (:quoteId, :revisionId, :hash, :expiresAt)`,
		{ replacements: { quoteId, revisionId, hash: tokenHash(token), expiresAt }, transaction: t }
	);
	return token;
}

export interface ResolvedLink {
	quoteId: string;
	revisionId: string;
	revision: number;
	state: string;
	expiresAt: Date;
	latestRevision: number;
	latestState: string;
	contactEmail: string;
}

/** What a token opens, or null for a token that was never issued (a shape check first, no query). */
export async function resolveLink(token: string): Promise<ResolvedLink | null> {
	if (!/^[A-Za-z0-9_-]{43}$/.test(token)) return null;
	const rows = await sequelize.query<{
		quote_id: string;
		revision_id: string;
		revision: number;
		state: string;
		expires_at: Date;
		latest_revision: number;
		latest_state: string;
		contact_email: string;
	}>(
		`SELECT l.quote_id, l.revision_id, r.revision, r.state, l.expires_at, latest.revision AS latest_revision,
		        latest.state AS latest_state, latest.contact_email
		 FROM quote_links l
		 JOIN quote_revisions r ON r.id = l.revision_id
		 JOIN LATERAL (SELECT revision, state, contact_email FROM quote_revisions WHERE quote_id = l.quote_id ORDER BY revision DESC LIMIT 1) latest ON true
		 WHERE l.token_hash = :hash`,
		{ replacements: { hash: tokenHash(token) }, type: QueryTypes.SELECT }
	);
	const r = rows[0];
	if (!r) return null;
	return {
		quoteId: r.quote_id,
		revisionId: r.revision_id,
		revision: r.revision,
		state: r.state,
		expiresAt: new Date(r.expires_at),
		latestRevision: r.latest_revision,
		latestState: r.latest_state,
		contactEmail: r.contact_email
	};
}

export async function recordAcceptance(
	a: { quoteId: string; revisionId: string; fullName: string; ip: string; userAgent: string; pdfSha256: string },
	t: Transaction
): Promise<void> {
	await sequelize.query(
		`INSERT INTO quote_acceptances (quote_id, revision_id, full_name, ip, user_agent, pdf_sha256)
		 VALUES (:quoteId, :revisionId, :fullName, :ip, :userAgent, :pdfSha256)`,
		{ replacements: a, transaction: t }
	);
}

export async function acceptanceOf(revisionId: string): Promise<{ fullName: string; acceptedAt: string } | null> {
	const rows = await sequelize.query<{ full_name: string; accepted_at: Date }>(
		`SELECT full_name, accepted_at FROM quote_acceptances WHERE revision_id = :revisionId`,
		{ replacements: { revisionId }, type: QueryTypes.SELECT }
	);
	return rows[0] ? { fullName: rows[0].full_name, acceptedAt: new Date(rows[0].accepted_at).toISOString() } : null;
}
