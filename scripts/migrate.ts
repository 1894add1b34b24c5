import { migrator } from '../src/lib/server/db/migrate';
import { sequelize } from '../src/lib/server/db';

const direction = process.argv[2] ?? 'up';
try {
	if (direction === 'down') await migrator.down();
	else await migrator.up();
} finally {
	await sequelize.close();
}
