import { fileURLToPath } from 'node:url';
import path from 'node:path';
import { Umzug, SequelizeStorage } from 'umzug';
import type { QueryInterface } from 'sequelize';
import { sequelize } from './index';

export type Migration = (params: { context: QueryInterface }) => Promise<void>;

const here = path.dirname(fileURLToPath(import.meta.url));

/** Umzug over the app's own Sequelize instance; migrations are TypeScript files run through tsx. */
export const migrator = new Umzug({
	migrations: { glob: ['migrations/*.ts', { cwd: here }] },
	context: sequelize.getQueryInterface(),
	storage: new SequelizeStorage({ sequelize, tableName: 'schema_migrations' }),
	logger: process.env.MIGRATE_QUIET === '1' ? undefined : console
});
