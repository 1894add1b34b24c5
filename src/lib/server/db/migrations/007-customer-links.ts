import type { Migration } from '../migrate';

export const up: Migration = async ({ context }) => {
	await context.sequelize.query(`
		-- the customer's private links: only the SHA-256 of the token is kept
		CREATE TABLE quote_links (
			id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
			quote_id uuid NOT NULL REFERENCES quotes(id) ON DELETE CASCADE,
			revision_id uuid NOT NULL REFERENCES quote_revisions(id) ON DELETE CASCADE,
			token_hash text NOT NULL UNIQUE,
			expires_at timestamptz NOT NULL,
			created_at timestamptz NOT NULL DEFAULT now()
		);
		CREATE INDEX quote_links_revision ON quote_links (revision_id);

		-- the customer's acceptance: typed name, time, address and the hash of the PDF they saw
		CREATE TABLE quote_acceptances (
			id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
			quote_id uuid NOT NULL REFERENCES quotes(id) ON DELETE CASCADE,
			revision_id uuid NOT NULL UNIQUE REFERENCES quote_revisions(id) ON DELETE CASCADE,
			full_name text NOT NULL,
			accepted_at timestamptz NOT NULL DEFAULT now(),
			ip text NOT NULL,
			user_agent text NOT NULL DEFAULT '',
			pdf_sha256 text NOT NULL
		);
	`);
};

export const down: Migration = async ({ context }) => {
	await context.sequelize.query(`DROP TABLE IF EXISTS quote_acceptances, quote_links;`);
};
