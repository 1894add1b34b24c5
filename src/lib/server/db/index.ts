import { AsyncLocalStorage } from 'node:async_hooks';
import pg from 'pg';
import { Sequelize } from 'sequelize';
import { config } from '../config';

function msFromEnv(name: string, fallback: number): number {
	const raw = process.env[name];
	if (raw === undefined || raw === '') return fallback;
	const value = Number(raw);
	if (!Number.isInteger(value) || value < 0) throw new Error(`${name} must be a whole number of milliseconds (0: no limit)`);
	return value;
}

/**
 * Time limits that keep a request from hanging on the database (ms). Together they keep a request
 * under 10 s whatever the database does: refuses connections (stopped), accepts them but never
 * answers (hung server, dropped packets), or holds a lock. scripts/migrate.ts lifts the two
 * statement limits (DB_STATEMENT_TIMEOUT_MS / DB_QUERY_TIMEOUT_MS = 0) for long schema changes.
 */
export const DB_LIMITS = {
	/** a new connection that does not complete its start-up within this fails */
	connectMs: 3_000,
	/** waiting for a free pooled connection (all busy) fails after this */
	acquireMs: 6_000,
	/** the server cancels a statement that runs (or waits on a lock) longer than this */
	statementMs: msFromEnv('DB_STATEMENT_TIMEOUT_MS', 6_000),
	/** the client gives up on a statement the server never answers; Sequelize then drops the connection */
	queryMs: msFromEnv('DB_QUERY_TIMEOUT_MS', 7_000)
} as const;

/** The one Sequelize instance of the process. A database that is away turns into a 503, never a hung request. */
export const sequelize = new Sequelize(config.databaseUrl, {
	dialect: 'postgres',
	dialectModule: pg,
	logging: process.env.SQL_LOG === '1' ? console.log : false,
	pool: { max: Number(process.env.DB_POOL_MAX ?? 10), min: 0, acquire: DB_LIMITS.acquireMs, idle: 10_000 },
	dialectOptions: {
		connectionTimeoutMillis: DB_LIMITS.connectMs,
		statement_timeout: DB_LIMITS.statementMs,
		query_timeout: DB_LIMITS.queryMs
	},
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
		// refused or reset connections; admin shutdown, cannot connect now, connection failures;
		// a statement cancelled by statement_timeout (a lock or an overloaded server)
		['ECONNREFUSED', 'ECONNRESET', 'EPIPE', 'ETIMEDOUT', '57P01', '57P02', '57P03', '08006', '08001', '08003', '08004', '57014'].includes(code) ||
		/Connection terminated|connect ECONNREFUSED|the database system is (starting up|shutting down|in recovery mode)|Query read timeout|timeout expired|not queryable/i.test(
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
