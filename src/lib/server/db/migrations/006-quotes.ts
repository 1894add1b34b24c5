import type { Migration } from '../migrate';

export const up: Migration = async ({ context }) => {
	await context.sequelize.query(`
		CREATE SEQUENCE quote_sequence;

		-- one row per quote; its revisions hold the figures
		CREATE TABLE quotes (
			id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
			year integer NOT NULL,
			sequence bigint NOT NULL,
			survey_id uuid NOT NULL REFERENCES surveys(id),
			customer_id uuid NOT NULL REFERENCES customers(id),
			site_id uuid REFERENCES sites(id),
			owner_id uuid NOT NULL REFERENCES users(id),
			team_id uuid REFERENCES teams(id) ON DELETE SET NULL,
			-- from the "build quote" form: a double tap makes one quote
			client_token text UNIQUE,
			created_at timestamptz NOT NULL DEFAULT now(),
			updated_at timestamptz NOT NULL DEFAULT now(),
			UNIQUE (year, sequence)
		);
		CREATE INDEX quotes_owner ON quotes (owner_id);
		CREATE INDEX quotes_team ON quotes (team_id);

		CREATE TABLE quote_revisions (
			id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
			quote_id uuid NOT NULL REFERENCES quotes(id) ON DELETE CASCADE,
			revision integer NOT NULL,
			number text NOT NULL UNIQUE,
			state text NOT NULL,
			price_book_version_id uuid NOT NULL REFERENCES price_book_versions(id),
			setup_id text NOT NULL,
			setup_name text NOT NULL,
			-- the engine's full answer and the input it was given, frozen with the revision
			engine_result jsonb NOT NULL,
			engine_input jsonb NOT NULL,
			overall_discount_bp integer NOT NULL DEFAULT 0 CHECK (overall_discount_bp BETWEEN 0 AND 10000),
			tax_region text,
			tax_label text,
			tax_rate_bp integer NOT NULL DEFAULT 0 CHECK (tax_rate_bp BETWEEN 0 AND 10000),
			deposit_share_bp integer NOT NULL CHECK (deposit_share_bp BETWEEN 0 AND 10000),
			validity_days integer NOT NULL,
			terms text NOT NULL DEFAULT '',
			notes text NOT NULL DEFAULT '',
			contact_name text NOT NULL DEFAULT '',
			contact_email text NOT NULL DEFAULT '',
			totals jsonb NOT NULL DEFAULT '{}'::jsonb,
			approval_required boolean NOT NULL DEFAULT false,
			approval_reasons jsonb NOT NULL DEFAULT '[]'::jsonb,
			valid_until timestamptz,
			sent_at timestamptz,
			pdf bytea,
			pdf_sha256 text,
			created_by uuid NOT NULL REFERENCES users(id),
			created_at timestamptz NOT NULL DEFAULT now(),
			updated_at timestamptz NOT NULL DEFAULT now(),
			UNIQUE (quote_id, revision)
		);
		CREATE INDEX quote_revisions_state ON quote_revisions (state);

		CREATE TABLE quote_lines (
			id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
			revision_id uuid NOT NULL REFERENCES quote_revisions(id) ON DELETE CASCADE,
			position integer NOT NULL,
			sku text NOT NULL,
			description text NOT NULL,
			kind text NOT NULL,
			quantity integer NOT NULL CHECK (quantity >= 0),
			unit_list_cents bigint NOT NULL CHECK (unit_list_cents >= 0),
			unit_cost_cents bigint NOT NULL CHECK (unit_cost_cents >= 0),
			line_discount_bp integer NOT NULL DEFAULT 0 CHECK (line_discount_bp BETWEEN 0 AND 10000),
			no_charge boolean NOT NULL DEFAULT false,
			source text NOT NULL,
			reason text NOT NULL DEFAULT '',
			in_price_book boolean NOT NULL DEFAULT true
		);
		CREATE INDEX quote_lines_revision ON quote_lines (revision_id, position);

		-- every transition: who, when, why
		CREATE TABLE quote_events (
			id bigserial PRIMARY KEY,
			quote_id uuid NOT NULL REFERENCES quotes(id) ON DELETE CASCADE,
			revision_id uuid NOT NULL REFERENCES quote_revisions(id) ON DELETE CASCADE,
			action text NOT NULL,
			from_state text,
			to_state text NOT NULL,
			actor_id uuid REFERENCES users(id),
			actor_role text NOT NULL,
			comment text,
			at timestamptz NOT NULL DEFAULT now()
		);
		CREATE INDEX quote_events_quote ON quote_events (quote_id, at);
	`);
};

export const down: Migration = async ({ context }) => {
	await context.sequelize.query(`
		DROP TABLE IF EXISTS quote_events, quote_lines, quote_revisions, quotes;
		DROP SEQUENCE IF EXISTS quote_sequence;
	`);
};
