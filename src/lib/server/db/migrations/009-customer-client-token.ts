import type { Migration } from '../migrate';

export const up: Migration = async ({ context }) => {
	await context.sequelize.query(`
		-- a random token from the "add a customer" form: a double tap makes one customer
		ALTER TABLE customers ADD COLUMN client_token text UNIQUE;
	`);
};

export const down: Migration = async ({ context }) => {
	await context.sequelize.query(`ALTER TABLE customers DROP COLUMN IF EXISTS client_token;`);
};
