/**
 * The customer's private quote page, `/q/<token>`: whether this build has the route, and a fresh
 * link to a sent quote, read from the e-mail that sending it queued (the token itself is never
 * readable from the database). Shared by the load test and `npm run bench`; relative imports only.
 */
import { readdirSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { QueryTypes } from 'sequelize';
import { sequelize } from '../../src/lib/server/db';

const ROUTES_DIR = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../../src/routes');

/** Route folders as URL segments: `(group)` folders add none. */
function routeFolders(dir: string, segments: string[] = []): string[][] {
	const out: string[][] = [];
	for (const entry of readdirSync(dir, { withFileTypes: true })) {
		if (!entry.isDirectory()) continue;
		const own = /^\(.*\)$/.test(entry.name) ? segments : [...segments, entry.name];
		out.push(own, ...routeFolders(path.join(dir, entry.name), own));
	}
	return out;
}

/** True when src/routes holds a `q/[token…]` page, in any route group. */
export function customerPageExists(): boolean {
	return routeFolders(ROUTES_DIR).some(
		(s) => s.length === 2 && s[0] === 'q' && /^\[token\b/.test(s[1])
	);
}

/** `/q/<token>` in a message's text or HTML; the token runs to the next space, quote, slash or query. */
const LINK = /\/q\/([^\s"'<>/?#]+)/;

/**
 * The token of the newest customer link mailed for this quote (queued in the outbox with the quote as
 * its related record, or addressed to `to` since `since`), waiting up to `timeoutMs` for it to be
 * queued. Null when no such message appears.
 */
export async function mailedQuoteToken(
	quoteId: string,
	opts: { to?: string; since?: Date; timeoutMs?: number } = {}
): Promise<string | null> {
	const deadline = Date.now() + (opts.timeoutMs ?? 5_000);
	for (;;) {
		const rows = await sequelize.query<{ text: string | null; html: string | null }>(
			`SELECT text, html FROM mail_outbox
			 WHERE (related_type = 'quote' AND related_id = :quoteId)
			    OR (to_address = :to AND created_at >= :since)
			 ORDER BY created_at DESC`,
			{
				replacements: {
					quoteId,
					to: opts.to ?? '',
					since: (opts.since ?? new Date(0)).toISOString()
				},
				type: QueryTypes.SELECT
			}
		);
		for (const r of rows) {
			const m = LINK.exec(r.text ?? '') ?? LINK.exec(r.html ?? '');
			if (m) return decodeURIComponent(m[1]);
		}
		if (Date.now() >= deadline) return null;
		await new Promise((resolve) => setTimeout(resolve, 250));
	}
}
