/**
 * Loads the invented demo data from seed-data/ when it is absent. Re-running adds only what is
 * missing (matched by e-mail, code, SKU or customer name); it never duplicates, changes or deletes data.
 * Refuses to run when TRAYWISE_ENV=production.
 */
import { sequelize } from '../src/lib/server/db';
import { seedDemo } from '../src/lib/server/db/seed';

if (process.env.TRAYWISE_ENV === 'production') {
	console.error('[seed] TRAYWISE_ENV=production: demo data is never loaded in production.');
	process.exit(1);
}
try {
	const added = await seedDemo();
	console.log(`[seed] ${added} demo records added${added === 0 ? ' (all present already)' : ''}`);
} finally {
	await sequelize.close();
}
