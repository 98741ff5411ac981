import { loadSettings } from '@localis/shared';
import { openDatabase } from '@localis/api/db';
import { loadScenario } from './load-scenario';

/** `tsx seeds/src/load.cli.ts`: load the demo scenario into the configured database. */
const settings = loadSettings(process.env);
const db = openDatabase(settings, { poolMax: 2 });
try {
  const r = await loadScenario(db, settings);
  const added = Object.entries(r).filter(([, n]) => n > 0).map(([k, n]) => `${n} ${k}`);
  console.log(added.length ? `demo scenario: added ${added.join(', ')}` : 'demo scenario: already loaded, nothing changed');
} catch (e) {
  console.error('loading the demo scenario failed:', e);
  process.exitCode = 1;
} finally {
  await db.close();
}
