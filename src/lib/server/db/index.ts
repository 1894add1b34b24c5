import { AsyncLocalStorage } from 'node:async_hooks';
import pg from 'pg';
import { Sequelize } from 'sequelize';
import { config } from '../config';

/**
 * The one Sequelize instance of the process. Connection failures surface quickly
 * (`connectionTimeoutMillis`) so a stopped database turns into a 503, never a hung request.
 */
export const sequelize = new Sequelize(config.databaseUrl, {
	dialect: 'postgres',
	dialectModule: pg,
	logging: process.env.SQL_LOG === '1' ? console.log : false,
	pool: { max: Number(process.env.DB_POOL_MAX ?? 10), min: 0, acquire: 8_000, idle: 10_000 },
	dialectOptions: { connectionTimeoutMillis: 4_000, statement_timeout: 8_000 },
	define: { underscored: true, timestamps: true }
});

/** True when the database answers a trivial query within a few seconds. */
export async function databaseIsUp(): Promise<boolean> {
	try {
		await Promise.race([
			sequelize.query('SELECT 1'),
			new Promise((_, reject) => setTimeout(() => reject(new Error('timeout')), 3_000))
		]);
		return true;
	} catch {
		return false;
	}
}

/** Errors that mean "the database is unreachable right now" rather than a bug. */
export function isDatabaseDownError(err: unknown): boolean {
	if (!err || typeof err !== 'object') return false;
	const name = (err as { name?: string }).name ?? '';
	const code =
		(err as { original?: { code?: string } }).original?.code ??
		(err as { parent?: { code?: string } }).parent?.code ??
		(err as { code?: string }).code ??
		'';
	return (
		name === 'SequelizeConnectionError' ||
		name === 'SequelizeConnectionRefusedError' ||
		name === 'SequelizeConnectionAcquireTimeoutError' ||
		name === 'SequelizeHostNotReachableError' ||
		name === 'ConnectionAcquireTimeoutError' ||
		['ECONNREFUSED', 'ECONNRESET', '57P01', '57P03', '08006', '08001', '08003'].includes(code) ||
		/Connection terminated|connect ECONNREFUSED|the database system is (starting up|shutting down)/i.test(
			String((err as { message?: string }).message ?? '')
		)
	);
}

/**
 * Counts the SQL statements run while handling one request (tests and the benchmark read it from
 * the `x-sql-queries` response header when TRAYWISE_COUNT_QUERIES=1).
 */
export const queryCounter = new AsyncLocalStorage<{ n: number }>();
(sequelize as unknown as { addHook(name: string, fn: () => void): void }).addHook('beforeQuery', () => {
	const store = queryCounter.getStore();
	if (store) store.n++;
});
