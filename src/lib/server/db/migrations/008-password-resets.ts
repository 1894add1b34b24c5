import type { Migration } from '../migrate';

export const up: Migration = async ({ context }) => {
	await context.sequelize.query(`
		-- only the SHA-256 of a reset token is kept; a token works once, for 30 minutes
		CREATE TABLE password_resets (
			id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
			user_id uuid NOT NULL REFERENCES users(id) ON DELETE CASCADE,
			token_hash text NOT NULL UNIQUE,
			expires_at timestamptz NOT NULL,
			used_at timestamptz,
			created_at timestamptz NOT NULL DEFAULT now()
		);
		CREATE INDEX password_resets_user ON password_resets (user_id);
	`);
};

export const down: Migration = async ({ context }) => {
	await context.sequelize.query(`DROP TABLE IF EXISTS password_resets;`);
};
