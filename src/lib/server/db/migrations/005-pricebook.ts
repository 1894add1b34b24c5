import type { Migration } from '../migrate';

/**
 * The versioned price book, the dealer's company settings (one row) and sales-tax rates by region.
 *
 * A price-book version is written once, as a draft, and becomes read-only when published: the
 * triggers below refuse changes to a published version's items, label and date, and any status
 * change other than draft → active → archived. Quotes refer to the version they were priced on, so
 * a published version must stay exactly as it was.
 */
export const up: Migration = async ({ context }) => {
	await context.sequelize.query(`
		CREATE TABLE price_book_versions (
			id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
			label text NOT NULL CHECK (length(label) BETWEEN 1 AND 120),
			effective_date date NOT NULL,
			status text NOT NULL DEFAULT 'draft' CHECK (status IN ('draft', 'active', 'archived')),
			created_by uuid REFERENCES users(id) ON DELETE SET NULL,
			published_at timestamptz,
			published_by uuid REFERENCES users(id) ON DELETE SET NULL,
			created_at timestamptz NOT NULL DEFAULT now(),
			updated_at timestamptz NOT NULL DEFAULT now(),
			CHECK ((status = 'draft') = (published_at IS NULL))
		);
		-- exactly one active version at a time (publishing archives the previous one first)
		CREATE UNIQUE INDEX price_book_versions_one_active ON price_book_versions ((true)) WHERE status = 'active';
		CREATE INDEX price_book_versions_created ON price_book_versions (created_at DESC);

		CREATE TABLE price_book_items (
			id bigserial PRIMARY KEY,
			version_id uuid NOT NULL REFERENCES price_book_versions(id) ON DELETE CASCADE,
			sku text NOT NULL CHECK (length(sku) BETWEEN 1 AND 64),
			description text NOT NULL CHECK (length(description) BETWEEN 1 AND 200),
			kind text NOT NULL
				CHECK (kind IN ('truck', 'setup', 'accessory', 'freight', 'installation', 'battery', 'charger')),
			-- cents; the same ceiling as the CSV reader ($99,999,999.99)
			list_cents bigint NOT NULL CHECK (list_cents BETWEEN 0 AND 9999999999),
			cost_cents bigint NOT NULL CHECK (cost_cents BETWEEN 0 AND 9999999999),
			UNIQUE (version_id, sku)
		);
		CREATE INDEX price_book_items_version_kind ON price_book_items (version_id, kind, sku);

		CREATE FUNCTION price_book_versions_guard() RETURNS trigger LANGUAGE plpgsql AS $$
		BEGIN
			IF TG_OP = 'DELETE' THEN
				IF OLD.status <> 'draft' THEN
					RAISE EXCEPTION 'price book version % is published and cannot be deleted', OLD.id
						USING ERRCODE = 'check_violation';
				END IF;
				RETURN OLD;
			END IF;
			IF NOT (
				(OLD.status = 'draft' AND NEW.status IN ('draft', 'active'))
				OR (OLD.status = 'active' AND NEW.status IN ('active', 'archived'))
				OR (OLD.status = 'archived' AND NEW.status = 'archived')
			) THEN
				RAISE EXCEPTION 'price book version % cannot go from % to %', OLD.id, OLD.status, NEW.status
					USING ERRCODE = 'check_violation';
			END IF;
			IF OLD.status <> 'draft' AND (
				NEW.label IS DISTINCT FROM OLD.label
				OR NEW.effective_date IS DISTINCT FROM OLD.effective_date
				OR NEW.published_at IS DISTINCT FROM OLD.published_at
			) THEN
				RAISE EXCEPTION 'price book version % is published and cannot be changed', OLD.id
					USING ERRCODE = 'check_violation';
			END IF;
			RETURN NEW;
		END $$;
		CREATE TRIGGER price_book_versions_guard BEFORE UPDATE OR DELETE ON price_book_versions
			FOR EACH ROW EXECUTE FUNCTION price_book_versions_guard();

		CREATE FUNCTION price_book_items_guard() RETURNS trigger LANGUAGE plpgsql AS $$
		DECLARE
			v_status text;
		BEGIN
			-- while a draft is deleted, its items go by cascade after the version row: no row, no refusal
			IF TG_OP IN ('UPDATE', 'DELETE') THEN
				SELECT status INTO v_status FROM price_book_versions WHERE id = OLD.version_id;
				IF v_status IS NOT NULL AND v_status <> 'draft' THEN
					RAISE EXCEPTION 'price book version % is published; its items cannot be changed', OLD.version_id
						USING ERRCODE = 'check_violation';
				END IF;
			END IF;
			IF TG_OP IN ('INSERT', 'UPDATE') THEN
				SELECT status INTO v_status FROM price_book_versions WHERE id = NEW.version_id;
				IF v_status IS NOT NULL AND v_status <> 'draft' THEN
					RAISE EXCEPTION 'price book version % is published; its items cannot be changed', NEW.version_id
						USING ERRCODE = 'check_violation';
				END IF;
				RETURN NEW;
			END IF;
			RETURN OLD;
		END $$;
		CREATE TRIGGER price_book_items_guard BEFORE INSERT OR UPDATE OR DELETE ON price_book_items
			FOR EACH ROW EXECUTE FUNCTION price_book_items_guard();

		-- one row (id = 1), created here so the app always has settings to read
		CREATE TABLE company_settings (
			id smallint PRIMARY KEY DEFAULT 1 CHECK (id = 1),
			dealer_name text NOT NULL CHECK (length(dealer_name) BETWEEN 1 AND 120),
			address text NOT NULL DEFAULT '',
			phone text NOT NULL DEFAULT '',
			email text NOT NULL DEFAULT '',
			-- a server-made file name under UPLOAD_DIR (<uuid>.png or <uuid>.jpg), never the user's
			logo_path text CHECK (logo_path ~ '^[0-9a-f-]{36}\\.(png|jpg)$'),
			rep_discount_authority_bp integer NOT NULL CHECK (rep_discount_authority_bp BETWEEN 0 AND 10000),
			margin_floor_bp integer NOT NULL CHECK (margin_floor_bp BETWEEN 0 AND 10000),
			deposit_share_bp integer NOT NULL CHECK (deposit_share_bp BETWEEN 0 AND 10000),
			quote_validity_days integer NOT NULL CHECK (quote_validity_days BETWEEN 1 AND 365),
			terms_text text NOT NULL DEFAULT '',
			currency text NOT NULL DEFAULT 'USD' CHECK (currency ~ '^[A-Z]{3}$'),
			time_zone text NOT NULL DEFAULT 'UTC',
			updated_by uuid REFERENCES users(id) ON DELETE SET NULL,
			created_at timestamptz NOT NULL DEFAULT now(),
			updated_at timestamptz NOT NULL DEFAULT now()
		);

		CREATE TABLE tax_rates (
			id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
			region_code text NOT NULL UNIQUE CHECK (region_code ~ '^[A-Z0-9]{1,8}(-[A-Z0-9]{1,8}){0,2}$'),
			label text NOT NULL CHECK (length(label) BETWEEN 1 AND 120),
			rate_bp integer NOT NULL CHECK (rate_bp BETWEEN 0 AND 10000),
			created_at timestamptz NOT NULL DEFAULT now(),
			updated_at timestamptz NOT NULL DEFAULT now()
		);
	`);

	// Invented defaults for the demo dealer; an admin changes them on /admin/settings.
	await context.sequelize.query(
		`INSERT INTO company_settings (id, dealer_name, address, phone, email, rep_discount_authority_bp,
			margin_floor_bp, deposit_share_bp, quote_validity_days, terms_text, currency, time_zone)
		VALUES (1, :dealerName, :address, :phone, :email, 1000, 1800, 2000, 30, :terms, 'USD', 'America/Los_Angeles')
		ON CONFLICT (id) DO NOTHING`,
		{
			replacements: {
				dealerName: 'Orrin Bay Lift Service',
				address: '410 Wharfside Avenue\nUnit 7\nOrrin Bay, WA 98470',
				phone: '+1 360 555 0142',
				email: 'quotes@orrinbay-lift.test',
				terms: [
					'Prices are in US dollars and hold until the validity date shown on this quote.',
					'A deposit of the share shown is due on acceptance; the balance is due on delivery.',
					'Delivery dates are confirmed once the deposit is received.',
					'Equipment stays the property of the dealer until paid in full.'
				].join('\n')
			}
		}
	);
};

export const down: Migration = async ({ context }) => {
	await context.sequelize.query(`
		DROP TABLE IF EXISTS tax_rates, company_settings, price_book_items, price_book_versions CASCADE;
		DROP FUNCTION IF EXISTS price_book_items_guard(), price_book_versions_guard();
	`);
};
