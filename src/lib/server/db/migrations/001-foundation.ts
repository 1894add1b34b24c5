import type { Migration } from '../migrate';

export const up: Migration = async ({ context }) => {
	await context.sequelize.query(`
		CREATE TABLE teams (
			id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
			name text NOT NULL UNIQUE,
			created_at timestamptz NOT NULL DEFAULT now(),
			updated_at timestamptz NOT NULL DEFAULT now()
		);

		CREATE TABLE users (
			id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
			email text NOT NULL,
			name text NOT NULL,
			role text NOT NULL CHECK (role IN ('rep', 'manager', 'admin')),
			team_id uuid REFERENCES teams(id) ON DELETE SET NULL,
			password_hash text NOT NULL,
			active boolean NOT NULL DEFAULT true,
			unit_system text NOT NULL DEFAULT 'metric' CHECK (unit_system IN ('metric', 'imperial')),
			created_at timestamptz NOT NULL DEFAULT now(),
			updated_at timestamptz NOT NULL DEFAULT now()
		);
		CREATE UNIQUE INDEX users_email_lower ON users (lower(email));

		-- id is the SHA-256 hash of the session token: a stolen table reveals no usable cookie
		CREATE TABLE sessions (
			id text PRIMARY KEY,
			user_id uuid NOT NULL REFERENCES users(id) ON DELETE CASCADE,
			expires_at timestamptz NOT NULL,
			created_at timestamptz NOT NULL DEFAULT now()
		);
		CREATE INDEX sessions_user ON sessions (user_id);

		-- failed sign-ins, shared by every app process (throttling must not live in memory)
		CREATE TABLE sign_in_failures (
			id bigserial PRIMARY KEY,
			key text NOT NULL,
			at timestamptz NOT NULL DEFAULT now()
		);
		CREATE INDEX sign_in_failures_key_at ON sign_in_failures (key, at);

		CREATE TABLE truck_models (
			id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
			code text NOT NULL UNIQUE,
			name text NOT NULL,
			family text NOT NULL,
			capacity_kg integer NOT NULL,
			spec jsonb NOT NULL,
			price_cents bigint NOT NULL DEFAULT 0,
			cost_cents bigint NOT NULL DEFAULT 0,
			retired boolean NOT NULL DEFAULT false,
			created_at timestamptz NOT NULL DEFAULT now(),
			updated_at timestamptz NOT NULL DEFAULT now()
		);

		CREATE TABLE batteries (
			id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
			code text NOT NULL UNIQUE,
			name text NOT NULL,
			spec jsonb NOT NULL,
			price_cents bigint NOT NULL DEFAULT 0,
			cost_cents bigint NOT NULL DEFAULT 0,
			retired boolean NOT NULL DEFAULT false,
			created_at timestamptz NOT NULL DEFAULT now(),
			updated_at timestamptz NOT NULL DEFAULT now()
		);

		CREATE TABLE truck_model_batteries (
			truck_model_id uuid NOT NULL REFERENCES truck_models(id) ON DELETE CASCADE,
			battery_id uuid NOT NULL REFERENCES batteries(id) ON DELETE CASCADE,
			PRIMARY KEY (truck_model_id, battery_id)
		);

		CREATE TABLE equipment (
			id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
			sku text NOT NULL UNIQUE,
			kind text NOT NULL,
			name text NOT NULL,
			spec jsonb NOT NULL DEFAULT '{}'::jsonb,
			price_cents bigint NOT NULL DEFAULT 0,
			cost_cents bigint NOT NULL DEFAULT 0,
			retired boolean NOT NULL DEFAULT false,
			created_at timestamptz NOT NULL DEFAULT now(),
			updated_at timestamptz NOT NULL DEFAULT now()
		);
		CREATE INDEX equipment_kind ON equipment (kind);
	`);
};

export const down: Migration = async ({ context }) => {
	await context.sequelize.query(`
		DROP TABLE IF EXISTS sign_in_failures, equipment, truck_model_batteries, batteries, truck_models, sessions, users, teams CASCADE;
	`);
};
