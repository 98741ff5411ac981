import 'dotenv/config';
import { loadSettings } from '@localis/shared';
import { openDatabase } from './database';
import { createMigrator } from './migrator';

/** `tsx src/db/migrate.cli.ts up|down|status`: run, undo one, or list migrations. */
const command = process.argv[2] ?? 'up';
const db = openDatabase(loadSettings(process.env), { poolMax: 2 });
const migrator = createMigrator(db.sequelize);
try {
  if (command === 'up') {
    const done = await migrator.up();
    console.log(done.length ? `migrated: ${done.map((m) => m.name).join(', ')}` : 'migrations: up to date');
  } else if (command === 'down') {
    const undone = await migrator.down();
    console.log(undone.length ? `reverted: ${undone.map((m) => m.name).join(', ')}` : 'nothing to revert');
  } else if (command === 'status') {
    for (const m of await migrator.executed()) console.log(`done     ${m.name}`);
    for (const m of await migrator.pending()) console.log(`pending  ${m.name}`);
  } else {
    console.error(`unknown command ${command}; use up, down or status`);
    process.exitCode = 2;
  }
} catch (e) {
  console.error('migration failed:', e);
  process.exitCode = 1;
} finally {
  await db.close();
}
