import type { Migration } from '../migrate';

export const up: Migration = async ({ context }) => {
	await context.sequelize.query(`
		-- the dealer's shared book: every staff member sees every customer
		CREATE TABLE customers (
			id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
			name text NOT NULL,
			account_number text,
			notes text NOT NULL DEFAULT '',
			owner_id uuid REFERENCES users(id) ON DELETE SET NULL,
			team_id uuid REFERENCES teams(id) ON DELETE SET NULL,
			created_at timestamptz NOT NULL DEFAULT now(),
			updated_at timestamptz NOT NULL DEFAULT now()
		);
		CREATE UNIQUE INDEX customers_account_number_lower ON customers (lower(account_number))
			WHERE account_number IS NOT NULL;
		CREATE INDEX customers_name_lower ON customers (lower(name), id);
		CREATE INDEX customers_created ON customers (created_at, id);
		CREATE INDEX customers_updated ON customers (updated_at, id);

		CREATE TABLE sites (
			id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
			customer_id uuid NOT NULL REFERENCES customers(id) ON DELETE CASCADE,
			name text NOT NULL,
			address_line1 text NOT NULL,
			address_line2 text NOT NULL DEFAULT '',
			city text NOT NULL,
			postal_code text NOT NULL DEFAULT '',
			country text NOT NULL,
			-- short tax region code such as WA or EU-DE; free text, validated by the schema
			region_code text NOT NULL DEFAULT '',
			created_at timestamptz NOT NULL DEFAULT now(),
			updated_at timestamptz NOT NULL DEFAULT now()
		);
		CREATE INDEX sites_customer ON sites (customer_id);
		CREATE INDEX sites_city_lower ON sites (lower(city));

		CREATE TABLE contacts (
			id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
			customer_id uuid NOT NULL REFERENCES customers(id) ON DELETE CASCADE,
			site_id uuid REFERENCES sites(id) ON DELETE SET NULL,
			name text NOT NULL,
			role_title text NOT NULL DEFAULT '',
			email text NOT NULL DEFAULT '',
			phone text NOT NULL DEFAULT '',
			created_at timestamptz NOT NULL DEFAULT now(),
			updated_at timestamptz NOT NULL DEFAULT now()
		);
		CREATE INDEX contacts_customer ON contacts (customer_id);

		-- files live under UPLOAD_DIR as <uuid>.<ext from the bytes>; the sent name is for display only
		CREATE TABLE uploads (
			id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
			owner_type text NOT NULL CHECK (owner_type IN ('customer', 'survey', 'company')),
			owner_id uuid NOT NULL,
			kind text NOT NULL CHECK (kind IN ('photo', 'floor-plan', 'logo')),
			original_name text NOT NULL,
			stored_name text NOT NULL UNIQUE,
			thumb_name text UNIQUE,
			mime text NOT NULL,
			size_bytes integer NOT NULL CHECK (size_bytes > 0),
			sha256 text NOT NULL,
			width integer,
			height integer,
			created_by uuid REFERENCES users(id) ON DELETE SET NULL,
			created_at timestamptz NOT NULL DEFAULT now()
		);
		CREATE INDEX uploads_owner ON uploads (owner_type, owner_id, created_at);
	`);
};

export const down: Migration = async ({ context }) => {
	await context.sequelize.query(`DROP TABLE IF EXISTS uploads, contacts, sites, customers CASCADE;`);
};
