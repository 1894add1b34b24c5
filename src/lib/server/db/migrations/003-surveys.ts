import type { Migration } from '../migrate';

export const up: Migration = async ({ context }) => {
	await context.sequelize.query(`
		CREATE TABLE surveys (
			id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
			customer_id uuid NOT NULL REFERENCES customers(id),
			site_id uuid REFERENCES sites(id),
			owner_id uuid NOT NULL REFERENCES users(id),
			team_id uuid REFERENCES teams(id) ON DELETE SET NULL,
			status text NOT NULL DEFAULT 'draft' CHECK (status IN ('draft', 'complete')),
			current_step text NOT NULL DEFAULT 'site',
			data jsonb NOT NULL DEFAULT '{}'::jsonb,
			version integer NOT NULL DEFAULT 0,
			chosen_setup text CHECK (chosen_setup IN ('in-truck', 'roller-bed', 'trolley-stand', 'overhead-hoist')),
			result jsonb,
			evaluated_input jsonb,
			chosen_at timestamptz,
			chosen_by uuid REFERENCES users(id),
			-- a random token from the "new survey" form: a double tap creates one survey
			client_token text UNIQUE,
			created_at timestamptz NOT NULL DEFAULT now(),
			updated_at timestamptz NOT NULL DEFAULT now()
		);
		CREATE INDEX surveys_owner ON surveys (owner_id);
		CREATE INDEX surveys_team ON surveys (team_id);
		CREATE INDEX surveys_customer ON surveys (customer_id);
	`);
};

export const down: Migration = async ({ context }) => {
	await context.sequelize.query(`DROP TABLE IF EXISTS surveys;`);
};
