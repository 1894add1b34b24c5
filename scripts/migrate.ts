// A schema change on a big table may run longer than the app's per-statement limits: lift them here
// (before the database module is loaded, hence the dynamic imports).
process.env.DB_STATEMENT_TIMEOUT_MS ||= '0';
process.env.DB_QUERY_TIMEOUT_MS ||= '0';
const { migrator } = await import('../src/lib/server/db/migrate');
const { sequelize } = await import('../src/lib/server/db');

const direction = process.argv[2] ?? 'up';
try {
	if (direction === 'down') await migrator.down();
	else await migrator.up();
} finally {
	await sequelize.close();
}
